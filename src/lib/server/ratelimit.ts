import { RateLimitedError } from './errors';
import { now } from './clock';

// Fixed-window counters in memory: enough for one process on one machine,
// which is how Patchwright is deployed (see README "Scaling").

export interface RateLimiter {
	/** true when the call is allowed; counts it. */
	hit(key: string): boolean;
	/** seconds until `key` may try again without counting (0: allowed now). */
	retryAfter(key: string): number;
	/** counts without refusing (e.g. a failed password). */
	count(key: string): void;
	reset(key?: string): void;
}

export function rateLimiter(limit: number, windowMs: number): RateLimiter {
	const windows = new Map<string, { start: number; count: number }>();
	const current = (key: string, at: number) => {
		const w = windows.get(key);
		return w && at - w.start < windowMs ? w : undefined;
	};
	const bump = (key: string) => {
		const at = now();
		const w = current(key, at);
		if (w) {
			w.count++;
			return w;
		}
		if (windows.size > 10_000) {
			for (const [k, old] of windows) if (at - old.start >= windowMs) windows.delete(k);
		}
		const fresh = { start: at, count: 1 };
		windows.set(key, fresh);
		return fresh;
	};
	return {
		hit: (key) => bump(key).count <= limit,
		count: (key) => void bump(key),
		retryAfter(key) {
			const at = now();
			const w = current(key, at);
			if (!w || w.count < limit) return 0;
			return Math.max(1, Math.ceil((w.start + windowMs - at) / 1000));
		},
		reset(key) {
			if (key === undefined) windows.clear();
			else windows.delete(key);
		}
	};
}

/** "try again in 3 minutes" — whole minutes, never "0 minutes". */
export function retryWords(seconds: number): string {
	const minutes = Math.max(1, Math.ceil(seconds / 60));
	return minutes === 1 ? 'in 1 minute' : `in ${minutes} minutes`;
}

/**
 * Counts one mail-sending call against each limiter (per address, per sender …) and
 * throws RateLimitedError — before anything is written — when any of them is spent.
 */
export function throttle(what: string, checks: [RateLimiter, string][]): void {
	for (const [limiter, key] of checks) {
		const wait = limiter.retryAfter(key);
		if (wait > 0) throw new RateLimitedError(`Too many ${what} — try again ${retryWords(wait)}.`, wait);
	}
	for (const [limiter, key] of checks) limiter.count(key);
}

const scale = Number(process.env.PATCHWRIGHT_RATE_SCALE || 1);
const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

/** Sign-in attempts: per client address (all tries) and per account (failed passwords). */
export const signInByIp = rateLimiter(30 * scale, MINUTE);
export const signInFailuresByAccount = rateLimiter(10 * scale, 15 * MINUTE);

/** Mail a stranger can make us send: sign-in links, sign-up and password links. */
export const linkMailByAddress = rateLimiter(5 * scale, HOUR);
export const linkMailByIp = rateLimiter(30 * scale, HOUR);

/** Mail a member makes us send to outside addresses: invitations and review links. */
export const memberMailBySender = rateLimiter(30 * scale, HOUR);
export const memberMailByAddress = rateLimiter(5 * scale, HOUR);

/** Review-link token lookups and sign-offs, per client address: tokens must not be guessable by trying. */
export const reviewLookupByIp = rateLimiter(60 * scale, MINUTE);
export const signoffByIp = rateLimiter(10 * scale, MINUTE);
