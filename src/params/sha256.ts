import type { ParamMatcher } from '@sveltejs/kit';
import { isSha256Hex } from '$lib/domain/photos/image-type';

/** A content hash: 64 lowercase hex digits (photos are found by it, never by a path). */
export const match: ParamMatcher = (param) => isSha256Hex(param);
