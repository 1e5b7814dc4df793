import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import { skipCSRFCheck } from '@auth/core';
import { CredentialsSignin } from '@auth/core/errors';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { authSecret, mailFrom, smtpUrl } from '../config';
import { db } from '../db/index';
import { accounts, sessions, users, verificationTokens } from '../db/schema';
import { findUserByEmail, findUserById, revokeSession, sessionState } from '../db/users';
import { signInLinkMail } from '../mail/templates';
import { queueMail } from '../mail/outbox';
import { signInFailuresByAccount } from '../ratelimit';
import { safeRedirect } from '../redirect';
import { verifyPassword, verifyAgainstDummy } from './password';
import { SESSION_MAX_AGE_S } from './session';

const credentialsInput = z.object({
	email: z.string().trim().toLowerCase().email().max(254),
	password: z.string().min(1).max(1000)
});

/** Too many wrong passwords for this account: the sign-in page says when to come back. */
class TooManyAttempts extends CredentialsSignin {
	constructor(minutes: number) {
		super();
		this.code = `too-many-${minutes}`;
	}
}

async function authorize(raw: unknown) {
	const parsed = credentialsInput.safeParse(raw);
	if (!parsed.success) return null;
	const { email, password } = parsed.data;
	// Checked before the password, so a guesser learns nothing from a right one inside the window;
	// only failures count, so the rightful owner is never locked out for longer than the window.
	const wait = signInFailuresByAccount.retryAfter(email);
	if (wait > 0) throw new TooManyAttempts(Math.ceil(wait / 60));
	const user = findUserByEmail(email);
	// An unknown address costs the same argon2 verify as a known one: no enumeration by timing.
	const ok = user?.passwordHash
		? await verifyPassword(user.passwordHash, password)
		: await verifyAgainstDummy(password);
	if (!user || !ok) {
		signInFailuresByAccount.count(email);
		return null;
	}
	signInFailuresByAccount.reset(email);
	return { id: user.id, email: user.email, name: user.name };
}

function buildConfig(): SvelteKitAuthConfig {
	return {
		adapter: DrizzleAdapter(db(), {
			usersTable: users,
			accountsTable: accounts,
			sessionsTable: sessions,
			verificationTokensTable: verificationTokens
		}),
		secret: authSecret(),
		trustHost: true,
		basePath: '/auth',
		// Credentials needs JWT sessions; the cookie is signed, encrypted and httpOnly. Each carries a
		// session id (`sid`, revocable one by one) and the user's session generation (all at once).
		session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_S },
		// Auth.js's own CSRF token is replaced by SvelteKit's origin check, which
		// refuses every cross-origin form POST before any handler runs.
		skipCSRFCheck,
		pages: { signIn: '/signin', error: '/signin', verifyRequest: '/signin/check-email' },
		providers: [
			Credentials({
				credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
				authorize
			}),
			Nodemailer({
				server: smtpUrl(),
				from: mailFrom(),
				// stored and answered; the outbox sends it, so a slow mail server never holds the page
				sendVerificationRequest({ identifier, url }) {
					queueMail(signInLinkMail(identifier, url), { kind: 'sign-in' });
					return Promise.resolve();
				}
			})
		],
		callbacks: {
			jwt({ token, user }) {
				if (user?.id) {
					token.sub = user.id;
					token.sid = randomUUID();
					token.gen = findUserById(user.id)?.sessionGeneration ?? 0;
					return token;
				}
				// Auth.js's own /auth/session answer obeys the same checks as every request
				if (!token.sub || typeof token.sid !== 'string') return null;
				const state = sessionState(token.sub, token.sid);
				if (!state || state.revoked || state.generation !== token.gen) return null;
				return token;
			},
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				return session;
			},
			redirect({ url, baseUrl }) {
				const origin = new URL(baseUrl).origin;
				const target = url.startsWith(origin + '/') ? url.slice(origin.length) : url;
				return `${origin}${safeRedirect(target)}`;
			}
		},
		events: {
			signOut(message) {
				const token = 'token' in message ? message.token : null;
				if (token && typeof token.sid === 'string') {
					const exp = typeof token.exp === 'number' ? token.exp * 1000 : Date.now() + SESSION_MAX_AGE_S * 1000;
					revokeSession(token.sid, new Date(exp));
				}
			}
		}
	};
}

// Built once, on the first request (not at import: the build must not open the database).
let config: SvelteKitAuthConfig | undefined;
export const { handle: authHandle } = SvelteKitAuth(() => Promise.resolve((config ??= buildConfig())));
