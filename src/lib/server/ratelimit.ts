// Fixed-window counters in memory: enough for one process on one machine,
// which is how Patchwright is deployed (see README "Scaling").

export interface RateLimiter {
	/** true when the call is allowed; counts it. */
	hit(key: string): boolean;
	reset(key?: string): void;
}

export function rateLimiter(limit: number, windowMs: number): RateLimiter {
	const windows = new Map<string, { start: number; count: number }>();
	return {
		hit(key) {
			const now = Date.now();
			const current = windows.get(key);
			if (!current || now - current.start >= windowMs) {
				if (windows.size > 10_000) {
					for (const [k, w] of windows) if (now - w.start >= windowMs) windows.delete(k);
				}
				windows.set(key, { start: now, count: 1 });
				return true;
			}
			current.count++;
			return current.count <= limit;
		},
		reset(key) {
			if (key === undefined) windows.clear();
			else windows.delete(key);
		}
	};
}

const scale = Number(process.env.PATCHWRIGHT_RATE_SCALE || 1);

/** Sign-in attempts: per client address and per account. */
export const signInByIp = rateLimiter(30 * scale, 60_000);
export const signInByAccount = rateLimiter(10 * scale, 5 * 60_000);

/** Review-link token lookups and sign-offs, per client address: tokens must not be guessable by trying. */
export const reviewLookupByIp = rateLimiter(60 * scale, 60_000);
export const signoffByIp = rateLimiter(10 * scale, 60_000);
