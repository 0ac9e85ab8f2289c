import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	// The hooks have already refused anyone without a role for this route.
	return { user: locals.user! };
};
