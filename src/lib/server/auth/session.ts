import type { Cookies } from '@sveltejs/kit';
import { decode, encode, type JWT } from '@auth/core/jwt';
import { LRUCache } from 'lru-cache';
import { authSecret } from '../config';
import { changeKey } from '../db/change-state';
import { sessionState } from '../db/users';

// The per-request session read (issue 14). Auth.js stays in charge of signing in and out; reading
// a session on every request skips its per-request machinery (building its config, decrypting
// the JWT, re-encrypting and re-setting the cookie): the decrypted token is kept per cookie value
// for a minute in a bounded LRU, and the cookie is re-issued only when it is a day old. What the
// cache can never skip is the one indexed read that makes sign-out, "sign out everywhere",
// password changes and account removal take effect at once.

export const SESSION_MAX_AGE_S = 30 * 24 * 60 * 60;
const REFRESH_AFTER_S = 24 * 60 * 60;

interface Verified {
	sub: string;
	sid: string;
	gen: number;
	iat: number;
	exp: number;
	token: JWT;
}

const verified = new LRUCache<string, Verified>({ max: 5_000, ttl: 60_000 });
// a cookie that failed to decrypt, remembered briefly so garbage costs one decrypt, not one per request
const rejected = new LRUCache<string, true>({ max: 5_000, ttl: 60_000 });

// requests whose session cookie was re-issued: their answer must carry the new cookie (page-cache.ts)
const renewed = new WeakSet<Cookies>();
// the database's change state each request's session was checked at, for the page cache's key
const checkedAt = new WeakMap<Cookies, string>();

/**
 * The session check's answer, kept per database change state: it stays true until the next write, and
 * sign-out, "sign out everywhere", password changes and account removal are all writes, as is any
 * other process's commit. Reading the change state costs about half the check's indexed read, and the
 * page cache reuses it for its key, so a kept page costs one read of it and no other.
 */
type Check = ReturnType<typeof sessionState>;
const checks = new LRUCache<string, { check: Check }>({ max: 5_000 });

function checkAt(state: string, userId: string, sid: string): Check {
	const key = `${state}\n${userId}\n${sid}`;
	const hit = checks.get(key);
	if (hit) return hit.check;
	const check = sessionState(userId, sid);
	checks.set(key, { check });
	return check;
}

/** The change state this request's session was checked at, if it had one. */
export function sessionCheckedAt(cookies: Cookies): string | undefined {
	return checkedAt.get(cookies);
}

/** True when readSession re-issued this request's session cookie. */
export function sessionRenewed(cookies: Cookies): boolean {
	return renewed.has(cookies);
}

export interface SessionUser {
	id: string;
	email: string;
	name: string | null;
}

function cookieName(secure: boolean): string {
	return `${secure ? '__Secure-' : ''}authjs.session-token`;
}

/** Auth.js splits a large cookie into name.0, name.1 …; ours is small, but read both forms. */
function readCookie(cookies: Cookies, name: string): string | undefined {
	const whole = cookies.get(name);
	if (whole) return whole;
	let joined = '';
	for (let i = 0; ; i++) {
		const part = cookies.get(`${name}.${i}`);
		if (!part) break;
		joined += part;
	}
	return joined || undefined;
}

async function verify(value: string, salt: string): Promise<Verified | null> {
	const hit = verified.get(value);
	if (hit) return hit;
	if (rejected.has(value)) return null;
	const token: JWT | null = await decode({ token: value, secret: authSecret(), salt }).catch(() => null);
	const { sub, sid, gen, iat, exp } = (token ?? {}) as Record<string, unknown>;
	if (
		!token ||
		typeof sub !== 'string' ||
		typeof sid !== 'string' ||
		typeof gen !== 'number' ||
		typeof iat !== 'number' ||
		typeof exp !== 'number'
	) {
		rejected.set(value, true);
		return null;
	}
	const entry = { sub, sid, gen, iat, exp, token };
	verified.set(value, entry);
	return entry;
}

export async function readSession(cookies: Cookies, secure: boolean): Promise<SessionUser | null> {
	const name = cookieName(secure);
	const value = readCookie(cookies, name);
	if (!value) return null;
	const session = await verify(value, name);
	const nowS = Date.now() / 1000;
	if (!session || session.exp <= nowS) return null;
	const at = changeKey();
	checkedAt.set(cookies, at);
	const state = checkAt(at, session.sub, session.sid);
	if (!state || state.revoked || state.generation !== session.gen || !state.email) {
		verified.delete(value);
		return null;
	}
	if (nowS - session.iat > REFRESH_AFTER_S) {
		// sliding expiry, as Auth.js does, but once a day instead of on every request
		const fresh = await encode({ token: session.token, secret: authSecret(), salt: name, maxAge: SESSION_MAX_AGE_S });
		cookies.set(name, fresh, {
			path: '/',
			httpOnly: true,
			sameSite: 'lax',
			secure,
			maxAge: SESSION_MAX_AGE_S
		});
		renewed.add(cookies);
	}
	return { id: session.sub, email: state.email, name: state.name };
}
