import { redirect } from '@sveltejs/kit';
import { emailOnly } from '$lib/schemas/account';
import { requestPasswordLink } from '$lib/server/accounts';
import { action, formValues, parseWith } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url, locals }) => ({
	email: locals.user?.email ?? url.searchParams.get('email') ?? ''
});

export const actions: Actions = {
	default: action('password-link', async (event, form) => {
		const { email } = parseWith(emailOnly, formValues(form));
		await requestPasswordLink(email, event.getClientAddress());
		redirect(303, `/signin/check-email?why=password&email=${encodeURIComponent(email)}`);
	})
};
