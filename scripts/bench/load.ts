import { existsSync } from 'node:fs';
import { runLoad } from '../../tests/load/load';
import type { BenchModule } from './harness';

// Mixed read/write load on the built server (tests/load/load.ts): 50 connections, 20 s,
// loopback. p99 against a 1 s target; throughput against 100 req/s (ratio = 100 / rps).
// Server and load generator share the machine's cores, so read the figures as a floor.
export const load: BenchModule = {
	name: 'load',
	benches: ['load-mixed-p99', 'load-mixed-rps'],
	skip: () => Promise.resolve(existsSync('build/handler.js') ? null : 'no build: run npm run build first'),
	async run() {
		const r = await runLoad({ seconds: 20, connections: 50 });
		if (r.status5xx || r.errors || r.timeouts)
			throw new Error(`load run failed: ${r.status5xx} × 5xx, ${r.errors} errors, ${r.timeouts} timeouts`);
		console.error(
			`load: ${r.requests} requests, p50 ${r.p50} ms, max ${r.max} ms, ${r.writesOk} writes ok, ${r.conflicts409} × 409`
		);
		return [
			{ name: 'load-mixed-p99', value: r.p99, unit: 'ms', ratio: r.p99 / 1000 },
			{ name: 'load-mixed-rps', value: r.rps, unit: 'req/s', ratio: 100 / r.rps }
		];
	}
};
