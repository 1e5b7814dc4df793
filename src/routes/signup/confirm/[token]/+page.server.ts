import { redirect } from '@sveltejs/kit';
import { findAccountToken, confirmSignUp } from '$lib/server/db/users';
import { action } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

// Confirming takes a button press (a POST): mail scanners open links, and must not spend the token.
export const load: PageServerLoad = ({ params }) => {
	const row = findAccountToken(params.token);
	return { valid: row?.purpose === 'signup', email: row?.purpose === 'signup' ? row.email : null };
};

export const actions: Actions = {
	default: action('confirm', (event) => {
		const { email } = confirmSignUp(event.params.token);
		redirect(303, `/signin?confirmed=1&email=${encodeURIComponent(email)}`);
	})
};
