import { publicBaseUrl } from './config';
import { hashPassword } from './auth/password';
import { assertStrongPassword } from './auth/policy';
import { createAccountToken, findUserByEmail, normaliseEmail } from './db/users';
import { queueMail } from './mail/outbox';
import { passwordMail, signUpMail } from './mail/templates';
import { linkMailByAddress, linkMailByIp, throttle } from './ratelimit';

// Sign-up and "set my password": both answer "check your e-mail" whatever the address, and only
// a link opened from that mailbox ever creates an account or changes a password.

/**
 * Unknown address: the chosen name and password wait (hashed) behind a link mailed to it.
 * Known address: the existing account is not touched; its mailbox gets a link to set a password.
 */
export async function requestSignUp(input: { name: string; email: string; password: string }, clientAddress: string) {
	const email = normaliseEmail(input.email);
	assertStrongPassword(input.password, [email, input.name]);
	throttle('e-mails to this address', [
		[linkMailByAddress, email],
		[linkMailByIp, clientAddress]
	]);
	const passwordHash = await hashPassword(input.password);
	if (findUserByEmail(email)) {
		const token = createAccountToken({ email, purpose: 'password' });
		queueMail(passwordMail(email, `${publicBaseUrl()}/account/password/${token}`, 'signup'), { kind: 'account' });
	} else {
		const token = createAccountToken({ email, purpose: 'signup', name: input.name, passwordHash });
		queueMail(signUpMail(email, `${publicBaseUrl()}/signup/confirm/${token}`), { kind: 'account' });
	}
}

/** Forgotten (or never set) password: a link only when the account exists, the same answer either way. */
export async function requestPasswordLink(emailInput: string, clientAddress: string) {
	const email = normaliseEmail(emailInput);
	throttle('e-mails to this address', [
		[linkMailByAddress, email],
		[linkMailByIp, clientAddress]
	]);
	// the same hashing work as sign-up, so the answer time does not tell known from unknown
	await hashPassword('timing only');
	if (!findUserByEmail(email)) return;
	const token = createAccountToken({ email, purpose: 'password' });
	queueMail(passwordMail(email, `${publicBaseUrl()}/account/password/${token}`, 'reset'), { kind: 'account' });
}
