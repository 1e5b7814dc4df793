import type { Handle } from '@sveltejs/kit';
import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';
import { sessionRenewed } from './auth/session';
import { changeKey } from './db/change-state';

// Rendered project pages, kept until the next write (issue 14). A server render of the patch page
// costs several times a cached API read (Svelte's render, devalue, the CSP hashes of the inline
// scripts), and a crew reloads the same pages between writes all night. The HTML of the pages
// listed below is a pure function of the database, the signed-in user, the URL and the theme
// cookie — nothing else (no clock, no files, no other header or cookie) — so one render serves
// every repeat of that request until something is written.
//
// The key holds the database's change state (`changeKey`: any write by this process or any other
// connection moves it), so a kept page is never older than the data. It also makes the cache safe
// without a second role check: the kept page was rendered for this user after `requireRole`
// passed, and membership, sessions and accounts are rows — a removed member, a revoked session or
// "sign out everywhere" is a write, which moves the key. A signed-out or expired session never
// reaches the cache (locals.user is null).
//
// Only a page no other state feeds may be added to CACHEABLE_ROUTES.

/** Route ids whose HTML depends only on the database, the user, the URL and the theme cookie. */
export const CACHEABLE_ROUTES: ReadonlySet<string> = new Set([
	'/projects/[id=int]',
	'/projects/[id=int]/patch',
	'/projects/[id=int]/universes',
	'/projects/[id=int]/universes/[n=int]',
	'/projects/[id=int]/radio',
	'/projects/[id=int]/power',
	'/projects/[id=int]/fixtures/[n=int]'
]);

/** The one cookie a page's markup reads (hooks.server.ts sets data-theme from it). */
const THEME_COOKIE = 'pw-theme';

interface KeptPage {
	headers: [string, string][];
	body: Uint8Array;
}

const kept = new LRUCache<string, KeptPage>({
	// a 20,000-fixture patch page is about 1.2 MB; 32 MB keeps a crew's pages without growing unbounded
	maxSize: 32 * 1024 * 1024,
	maxEntrySize: 8 * 1024 * 1024,
	sizeCalculation: (page) => page.body.byteLength + 1024,
	// entries of an old state are never asked for again; the TTL hands their memory back sooner than eviction
	ttl: 10 * 60_000
});

/** An entity tag naming the request's key without revealing it. */
function tagOf(key: string): string {
	return `"page-${createHash('sha256').update(key).digest('base64url').slice(0, 22)}"`;
}

function answer(page: KeptPage): Response {
	return new Response(page.body as Uint8Array<ArrayBuffer>, { status: 200, headers: page.headers });
}

/**
 * Serves a kept render of a cacheable page, or renders and keeps it. Runs after the session read
 * (it needs locals.user) and outside the security headers (so a kept page carries them).
 */
export const pageCache: Handle = async ({ event, resolve }) => {
	const user = event.locals.user;
	if (
		event.request.method !== 'GET' ||
		!user ||
		event.isDataRequest ||
		!CACHEABLE_ROUTES.has(event.route.id ?? '') ||
		// a re-issued session cookie has to reach the browser: render, and the answer carries it
		sessionRenewed(event.cookies)
	)
		return resolve(event);
	// the state the session was checked at, moments ago: the request is answered as of that read
	// (a client's own earlier write always came before it)
	const state = event.locals.readState ?? changeKey();
	const key = `${state}\n${user.id}\n${event.url.href}\n${event.cookies.get(THEME_COOKIE) ?? ''}`;
	const hit = kept.get(key);
	if (hit) return answer(hit);
	const response = await resolve(event);
	if (
		response.status !== 200 ||
		response.headers.has('set-cookie') ||
		!(response.headers.get('content-type') ?? '').startsWith('text/html')
	)
		return response;
	const body = new Uint8Array(await response.arrayBuffer());
	const headers = new Headers(response.headers);
	// the browser asks again every time (no-cache) and gets 304 while nothing changed; private keeps
	// shared caches out. compress.ts keeps the compressed form by this tag too.
	headers.set('etag', tagOf(key));
	headers.set('cache-control', 'private, no-cache');
	const page: KeptPage = { headers: [...headers], body };
	// written to while rendering: the page may show the newer state under the older key; let it go
	if (changeKey() === state) kept.set(key, page);
	return answer(page);
};
