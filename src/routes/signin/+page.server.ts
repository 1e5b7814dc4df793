import { redirect } from '@sveltejs/kit';
import { safeRedirect } from '$lib/server/redirect';
import type { PageServerLoad } from './$types';

const MESSAGES: Record<string, string> = {
	CredentialsSignin: 'Wrong e-mail or password.',
	TooManyAttempts: 'Too many sign-in attempts from here. Wait a minute and try again.',
	Verification: 'That sign-in link has expired or was already used. Ask for a new one.',
	EmailSignin: 'The sign-in mail could not be sent. Try again shortly.',
	Configuration: 'Sign-in is not available right now.'
};

function minutes(n: number): string {
	return n === 1 ? '1 minute' : `${n} minutes`;
}

function message(url: URL): string | null {
	const code = url.searchParams.get('error');
	if (!code) return null;
	const detail = url.searchParams.get('code') ?? '';
	const tooMany = /^too-many-(\d{1,4})$/.exec(detail);
	if (code === 'CredentialsSignin' && tooMany) {
		return `Too many attempts for this account — try again in ${minutes(Math.max(1, Number(tooMany[1])))}.`;
	}
	if (code === 'TooManyLinks') {
		const wait = Math.max(1, Math.min(9999, Number(url.searchParams.get('retry')) || 1));
		return `Too many sign-in links asked for — try again in ${minutes(wait)}.`;
	}
	return MESSAGES[code] ?? 'Sign-in failed. Try again.';
}

export const load: PageServerLoad = ({ locals, url }) => {
	const callbackUrl = safeRedirect(url.searchParams.get('callbackUrl'));
	if (locals.user) redirect(303, callbackUrl);
	const email = url.searchParams.get('email') ?? '';
	return {
		callbackUrl,
		error: message(url),
		notice: url.searchParams.has('confirmed')
			? 'Address confirmed and account created. Sign in with your password.'
			: url.searchParams.has('passwordSet')
				? 'Password set. Sign in with it.'
				: null,
		email: email.length <= 254 ? email : ''
	};
};
