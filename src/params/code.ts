import type { ParamMatcher } from '@sveltejs/kit';

/** Short codes for stations, lots and models: letters, digits and dashes. */
export const match: ParamMatcher = (param) => /^[A-Za-z0-9][A-Za-z0-9-]{0,39}$/.test(param);
