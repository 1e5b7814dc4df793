import { redirect } from '@sveltejs/kit';
import { changePassword, renameForm } from '$lib/schemas/account';
import { requestPasswordLink } from '$lib/server/accounts';
import { hashPassword, verifyPassword } from '$lib/server/auth/password';
import { assertStrongPassword } from '$lib/server/auth/policy';
import { requireUser } from '$lib/server/authz';
import {
	deleteUser,
	endAllSessions,
	findUserById,
	renameUser,
	setPassword,
	soleOwnedProjects
} from '$lib/server/db/users';
import { InvalidError, RateLimitedError } from '$lib/server/errors';
import { action, formValues, parseWith } from '$lib/server/forms';
import { retryWords, signInFailuresByAccount } from '$lib/server/ratelimit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	if (!locals.user) redirect(303, '/signin?callbackUrl=%2Faccount');
	const row = findUserById(locals.user.id);
	return {
		account: {
			email: locals.user.email,
			name: row?.name ?? '',
			hasPassword: !!row?.passwordHash,
			verified: !!row?.emailVerified
		},
		soleOwned: soleOwnedProjects(locals.user.id)
	};
};

export const actions: Actions = {
	rename: action('rename', (event, form) => {
		const user = requireUser(event);
		const { name } = parseWith(renameForm, formValues(form));
		renameUser(user.id, name);
		return { done: 'Name saved.', action: 'rename' };
	}),
	password: action('password', async (event, form) => {
		const user = requireUser(event);
		const { current, password } = parseWith(changePassword, formValues(form));
		// the same per-account throttle as the sign-in form: a stolen session must not guess freely
		const wait = signInFailuresByAccount.retryAfter(user.email);
		if (wait > 0) throw new RateLimitedError(`Too many attempts — try again ${retryWords(wait)}.`, wait);
		const row = findUserById(user.id);
		if (!row?.passwordHash || !(await verifyPassword(row.passwordHash, current))) {
			signInFailuresByAccount.count(user.email);
			throw new InvalidError('That is not your current password.', [
				{ path: ['current'], message: 'That is not your current password.' }
			]);
		}
		assertStrongPassword(password, [user.email, row.name ?? '']);
		setPassword(user.id, await hashPassword(password));
		// every session ends, this one too: sign in again with the new password
		redirect(303, `/signin?passwordSet=1&email=${encodeURIComponent(user.email)}`);
	}),
	passwordLink: action('passwordLink', async (event) => {
		const user = requireUser(event);
		await requestPasswordLink(user.email, event.getClientAddress());
		return { done: `A link to choose a password is on its way to ${user.email}.`, action: 'passwordLink' };
	}),
	signOutEverywhere: action('signOutEverywhere', (event) => {
		const user = requireUser(event);
		endAllSessions(user.id);
		redirect(303, '/signin?callbackUrl=%2Faccount');
	}),
	delete: action('delete', (event, form) => {
		const user = requireUser(event);
		if (
			String(form.get('confirm') ?? '')
				.trim()
				.toLowerCase() !== user.email
		) {
			throw new InvalidError('Type your e-mail address to confirm.', [
				{ path: ['confirm'], message: 'Type your e-mail address to confirm.' }
			]);
		}
		deleteUser(user.id);
		redirect(303, '/signin');
	})
};
