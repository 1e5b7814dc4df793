import { redirect } from '@sveltejs/kit';
import { signUp } from '$lib/schemas/account';
import { requestSignUp } from '$lib/server/accounts';
import { action, formValues, parseWith } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	if (locals.user) redirect(303, '/');
};

export const actions: Actions = {
	// The same answer for a new address and a known one: nobody learns who has an account here.
	default: action('signup', async (event, form) => {
		const input = parseWith(signUp, formValues(form));
		await requestSignUp(input, event.getClientAddress());
		redirect(303, `/signin/check-email?why=signup&email=${encodeURIComponent(input.email)}`);
	})
};
