import { redirect } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';

const MESSAGES: Record<string, string> = {
	CredentialsSignin: 'Wrong e-mail or password.',
	TooManyAttempts: 'Too many sign-in attempts from here. Wait a minute and try again.',
	Verification: 'That sign-in link has expired or was already used. Ask for a new one.',
	EmailSignin: 'The sign-in mail could not be sent. Try again shortly.',
	Configuration: 'Sign-in is not available right now.'
};

export const load: PageServerLoad = ({ locals, url }) => {
	const callbackUrl = safeCallback(url.searchParams.get('callbackUrl'), url.origin);
	if (locals.user) redirect(303, callbackUrl);
	const code = url.searchParams.get('error');
	return {
		callbackUrl,
		error: code ? (MESSAGES[code] ?? 'Sign-in failed. Try again.') : null,
		registered: url.searchParams.get('registered') === '1',
		email: url.searchParams.get('email') ?? ''
	};
};

/** Only paths on this site, so a crafted link cannot bounce a user elsewhere. */
function safeCallback(value: string | null, origin: string): string {
	if (!value) return '/';
	if (value.startsWith('/') && !value.startsWith('//')) return value;
	try {
		const parsed = new URL(value);
		return parsed.origin === origin ? parsed.pathname + parsed.search : '/';
	} catch {
		return '/';
	}
}
