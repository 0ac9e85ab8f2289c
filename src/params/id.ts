import type { ParamMatcher } from '@sveltejs/kit';

/** A row id: a positive integer. */
export const match: ParamMatcher = (param) => /^[1-9]\d{0,9}$/.test(param);
