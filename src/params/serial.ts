import type { ParamMatcher } from '@sveltejs/kit';
import { isSerial } from '$lib/domain/units/serial';

export const match: ParamMatcher = (param) => isSerial(param);
