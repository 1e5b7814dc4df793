import type { ParamMatcher } from '@sveltejs/kit';

// Numeric route ids (project, row ids, revision, universe and fixture numbers): a positive
// integer without sign, leading zero or exponent. Anything else matches no route (404).
export const match: ParamMatcher = (param) => /^[1-9][0-9]{0,14}$/.test(param);
