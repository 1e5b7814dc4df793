import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { authHandle } from '$lib/server/auth/index';
import { compressResponse } from '$lib/server/compress';
import { readSession, sessionCheckedAt } from '$lib/server/auth/session';
import { pageCache } from '$lib/server/page-cache';
import { db } from '$lib/server/db/index';
import { purgeRevokedSessions } from '$lib/server/db/users';
import { retryOutbox } from '$lib/server/mail/outbox';
import { linkMailByAddress, linkMailByIp, retryWords, signInByIp } from '$lib/server/ratelimit';

export const init: ServerInit = () => {
	// open the database (and apply pending migrations) before the first request
	db();
	const timer = setInterval(
		() => {
			retryOutbox().catch((err: unknown) => console.error('mail retry failed', err));
		},
		Number(process.env.MAIL_RETRY_INTERVAL_MS) || 30_000
	);
	timer.unref();
	const purge = setInterval(() => purgeRevokedSessions(), 3_600_000);
	purge.unref();
};

const limitSignIn: Handle = ({ event, resolve }) => {
	if (event.request.method === 'POST' && event.url.pathname.startsWith('/auth/callback/credentials')) {
		if (!signInByIp.hit(event.getClientAddress())) {
			return new Response(null, { status: 303, headers: { location: '/signin?error=TooManyAttempts' } });
		}
	}
	return resolve(event);
};

/**
 * Sign-in links are mail a stranger can make us send: per address and per client, before Auth.js
 * stores a token or queues a message. A browser goes back to the sign-in page with the wait named.
 */
const limitSignInLinks: Handle = async ({ event, resolve }) => {
	if (event.request.method === 'POST' && event.url.pathname === '/auth/signin/nodemailer') {
		let email = '';
		try {
			email = String((await event.request.clone().formData()).get('email') ?? '')
				.trim()
				.toLowerCase();
		} catch {
			/* Auth.js answers a malformed body itself */
		}
		const wait = Math.max(linkMailByAddress.retryAfter(email), linkMailByIp.retryAfter(event.getClientAddress()));
		if (wait > 0) {
			const message = `Too many sign-in links asked for — try again ${retryWords(wait)}.`;
			if ((event.request.headers.get('accept') ?? '').includes('text/html')) {
				const location = `/signin?error=TooManyLinks&retry=${Math.ceil(wait / 60)}`;
				return new Response(null, { status: 303, headers: { location, 'retry-after': String(wait) } });
			}
			return Response.json(
				{ error: { code: 'rate-limited', message }, retryAfter: wait },
				{ status: 429, headers: { 'retry-after': String(wait) } }
			);
		}
		linkMailByAddress.count(email);
		linkMailByIp.count(event.getClientAddress());
	}
	return resolve(event);
};

const readUser: Handle = async ({ event, resolve }) => {
	event.locals.user = await readSession(event.cookies, event.url.protocol === 'https:');
	// a read-only request reads as of its session check; a write's own changes must be seen by its loads
	if (event.locals.user && (event.request.method === 'GET' || event.request.method === 'HEAD'))
		event.locals.readState = sessionCheckedAt(event.cookies);
	return resolve(event);
};

const THEMES = new Set(['light', 'dark', 'dim']);

// The theme is a cookie so the server can set it before first paint: no inline script under the CSP.
const securityHeaders: Handle = async ({ event, resolve }) => {
	const theme = event.cookies.get('pw-theme');
	const response = await resolve(event, {
		transformPageChunk: ({ html }) =>
			theme && THEMES.has(theme) ? html.replace('<html lang="en">', `<html lang="en" data-theme="${theme}">`) : html
	});
	response.headers.set('x-content-type-options', 'nosniff');
	response.headers.set('referrer-policy', 'same-origin');
	response.headers.set('permissions-policy', 'camera=(self), microphone=(), geolocation=()');
	return response;
};

// outermost, so it sees each answer as it leaves: JSON and HTML go out as br or gzip when asked for
// (SvelteKit compares If-None-Match with the final ETag, coding suffix included, after every hook)
const compress: Handle = async ({ event, resolve }) => compressResponse(event.request, await resolve(event));

export const handle = sequence(
	compress,
	limitSignIn,
	limitSignInLinks,
	authHandle,
	readUser,
	pageCache,
	securityHeaders
);

export const handleError: HandleServerError = ({ error, status }) => {
	if (status !== 404) console.error(error);
	return { message: status === 404 ? 'Not found.' : 'Something went wrong on our side.', code: 'internal' };
};
