import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import { skipCSRFCheck } from '@auth/core';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { authSecret, mailFrom, smtpUrl } from '../config';
import { db } from '../db/index';
import { accounts, sessions, users, verificationTokens } from '../db/schema';
import { signInLinkMail } from '../mail/templates';
import { sendMail } from '../mail/outbox';
import { signInByAccount } from '../ratelimit';
import { verifyPassword } from './password';

const credentialsInput = z.object({
	email: z.string().trim().toLowerCase().email().max(254),
	password: z.string().min(1).max(1000)
});

async function authConfig(): Promise<SvelteKitAuthConfig> {
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
		// Credentials needs JWT sessions; the cookie is signed, encrypted and httpOnly.
		session: { strategy: 'jwt', maxAge: 30 * 24 * 60 * 60 },
		// Auth.js's own CSRF token is replaced by SvelteKit's origin check, which
		// refuses every cross-origin form POST before any handler runs.
		skipCSRFCheck,
		pages: { signIn: '/signin', error: '/signin', verifyRequest: '/signin/check-email' },
		providers: [
			Credentials({
				credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
				async authorize(raw) {
					const parsed = credentialsInput.safeParse(raw);
					if (!parsed.success) return null;
					const { email, password } = parsed.data;
					if (!signInByAccount.hit(email)) return null;
					const user = db().select().from(users).where(eq(users.email, email)).get();
					if (!user || !(await verifyPassword(user.passwordHash, password))) return null;
					signInByAccount.reset(email);
					return { id: user.id, email: user.email, name: user.name };
				}
			}),
			Nodemailer({
				server: smtpUrl(),
				from: mailFrom(),
				async sendVerificationRequest({ identifier, url }) {
					const sent = await sendMail(signInLinkMail(identifier, url));
					if (!sent) throw new Error('The sign-in mail could not be sent; try again shortly.');
				}
			})
		],
		callbacks: {
			jwt({ token, user }) {
				if (user?.id) token.sub = user.id;
				return token;
			},
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				return session;
			}
		}
	};
}

// built per request so tests and restarts pick up the environment they were given
export const { handle: authHandle } = SvelteKitAuth(authConfig);
