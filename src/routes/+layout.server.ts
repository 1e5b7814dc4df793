import type { LayoutServerLoad } from './$types';

// Only what the header needs reaches the browser.
export const load: LayoutServerLoad = ({ locals }) => ({
	user: locals.user ? { email: locals.user.email, name: locals.user.name } : null
});
