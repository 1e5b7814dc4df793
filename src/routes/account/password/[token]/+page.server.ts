import { redirect } from '@sveltejs/kit';
import { newPasswordForm } from '$lib/schemas/account';
import { hashPassword } from '$lib/server/auth/password';
import { assertStrongPassword } from '$lib/server/auth/policy';
import { findAccountToken, setPasswordByToken } from '$lib/server/db/users';
import { action, formValues, parseWith } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => {
	const row = findAccountToken(params.token);
	return { valid: row?.purpose === 'password', email: row?.purpose === 'password' ? row.email : null };
};

export const actions: Actions = {
	default: action('set-password', async (event, form) => {
		const { password } = parseWith(newPasswordForm, formValues(form));
		const row = findAccountToken(event.params.token);
		assertStrongPassword(password, row ? [row.email] : []);
		const { email } = setPasswordByToken(event.params.token, await hashPassword(password));
		redirect(303, `/signin?passwordSet=1&email=${encodeURIComponent(email)}`);
	})
};
