import { existsSync } from 'node:fs';
import { runLoad } from '../../tests/load/load';
import type { BenchModule } from './harness';

// Mixed read/write load on the built server (tests/load/load.ts), loopback. First one connection for
// 5 s (the idle p99: each request alone), then 50 connections for 20 s. load-mixed-p99's target is
// ≤ 250 ms (issue 14); its ratio is that p99 against the idle one — how much waiting 50 connections
// add. Throughput against 100 req/s (ratio = 100 / rps). Server and load generator share the
// machine's cores, so read the figures as a floor.
const P99_TARGET_MS = 250;

export const load: BenchModule = {
	name: 'load',
	benches: ['load-mixed-p99', 'load-mixed-rps'],
	skip: () => Promise.resolve(existsSync('build/handler.js') ? null : 'no build: run npm run build first'),
	async run() {
		const idle = await runLoad({ seconds: 5, connections: 1 });
		const r = await runLoad({ seconds: 20, connections: 50 });
		for (const x of [idle, r])
			if (x.status5xx || x.errors || x.timeouts)
				throw new Error(`load run failed: ${x.status5xx} × 5xx, ${x.errors} errors, ${x.timeouts} timeouts`);
		console.error(
			`load: idle (1 connection) p99 ${idle.p99} ms; 50 connections: ${r.requests} requests, p50 ${r.p50} ms, ` +
				`p99 ${r.p99} ms (target ≤ ${P99_TARGET_MS}), max ${r.max} ms, ${r.writesOk} writes ok, ${r.conflicts409} × 409`
		);
		return [
			{ name: 'load-mixed-p99', value: r.p99, unit: 'ms', ratio: r.p99 / Math.max(1, idle.p99) },
			{ name: 'load-mixed-rps', value: r.rps, unit: 'req/s', ratio: 100 / r.rps }
		];
	}
};
