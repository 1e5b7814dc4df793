import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { authHandle } from '$lib/server/auth/index';
import { db } from '$lib/server/db/index';
import { retryOutbox } from '$lib/server/mail/outbox';
import { signInByIp } from '$lib/server/ratelimit';

export const init: ServerInit = () => {
	// open the database (and apply pending migrations) before the first request
	db();
	const timer = setInterval(() => {
		retryOutbox().catch((err: unknown) => console.error('mail retry failed', err));
	}, 60_000);
	timer.unref();
};

const limitSignIn: Handle = ({ event, resolve }) => {
	if (event.request.method === 'POST' && event.url.pathname.startsWith('/auth/callback/credentials')) {
		if (!signInByIp.hit(event.getClientAddress())) {
			return new Response(null, { status: 303, headers: { location: '/signin?error=TooManyAttempts' } });
		}
	}
	return resolve(event);
};

const readSession: Handle = async ({ event, resolve }) => {
	const session = await event.locals.auth();
	const user = session?.user;
	event.locals.user = user?.id && user.email ? { id: user.id, email: user.email, name: user.name ?? null } : null;
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

export const handle = sequence(limitSignIn, authHandle, readSession, securityHeaders);

export const handleError: HandleServerError = ({ error, status }) => {
	if (status !== 404) console.error(error);
	return { message: status === 404 ? 'Not found.' : 'Something went wrong on our side.', code: 'internal' };
};
