import { describe, expect, it } from 'vitest';
import { runLoad } from '../load/load';

// The load run (tests/load/load.ts) bounded for npm test: 50 connections of mixed reads and
// writes for 10 s. It asserts correctness under load — no 5xx, no socket errors or timeouts,
// the writes went through — and never timings: the machine is shared (see npm run bench).

describe('under load', () => {
	it('50 connections of mixed reads and version-checked writes: zero 5xx, zero errors, zero timeouts', async () => {
		const r = await runLoad({ seconds: 10, connections: 50 });
		console.log(
			`load (npm test): ${r.requests} requests, ${r.rps.toFixed(1)} req/s, p99 ${r.p99} ms, ${r.writesOk} writes, ${r.conflicts409} × 409`
		);
		expect(r.status5xx).toBe(0);
		expect(r.errors).toBe(0);
		expect(r.timeouts).toBe(0);
		// the only 4xx allowed is a 409 when two connections held the same fixture
		expect(r.status4xx).toBe(r.conflicts409);
		expect(r.writesOk).toBeGreaterThan(0);
		expect(r.requests).toBeGreaterThan(r.writesOk * 4);
	}, 120_000);
});
