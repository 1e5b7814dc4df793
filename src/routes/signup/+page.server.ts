import { fail, redirect } from '@sveltejs/kit';
import { signUp } from '$lib/schemas/project';
import { createUser, EmailTakenError } from '$lib/server/db/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	if (locals.user) redirect(303, '/');
};

export const actions: Actions = {
	default: async ({ request }) => {
		const form = Object.fromEntries(await request.formData());
		const parsed = signUp.safeParse(form);
		const values = { name: String(form.name ?? ''), email: String(form.email ?? '') };
		if (!parsed.success) {
			const errors: Record<string, string> = {};
			for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message;
			return fail(400, { values, errors });
		}
		try {
			await createUser(parsed.data);
		} catch (err) {
			if (err instanceof EmailTakenError) {
				return fail(400, {
					values,
					errors: { email: 'An account with this e-mail already exists. Sign in instead.' } as Record<string, string>
				});
			}
			throw err;
		}
		redirect(303, `/signin?registered=1&email=${encodeURIComponent(parsed.data.email)}`);
	}
};
