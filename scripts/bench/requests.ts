// Request cost against the built server (issue 14): a signed-in API read and a server-rendered page,
// each against its baseline, in one run with subject and baseline alternating round by round so a
// busy machine slows both alike. 10 connections, as the issue measured; the median of the rounds.
import autocannon from 'autocannon';
import { existsSync } from 'node:fs';
import { startServer, type TestServer } from '../../tests/helpers/server';
import type { BenchLine, BenchModule } from './harness';

const ROUNDS = 3;
const SECONDS = 4;
const CONNECTIONS = 10;

function median(xs: number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	const mid = s.length >> 1;
	return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

async function rps(server: TestServer, path: string, headers: Record<string, string>, seconds = SECONDS) {
	const r = await autocannon({ url: `${server.url}${path}`, connections: CONNECTIONS, duration: seconds, headers });
	if (r.non2xx > 0 || r.errors > 0) throw new Error(`${path}: ${r.non2xx} non-2xx, ${r.errors} errors under load`);
	return r.requests.average;
}

export const requests: BenchModule = {
	name: 'requests',
	benches: ['api-signed-rps', 'page-ssr-rps'],
	skip: () => Promise.resolve(existsSync('build/handler.js') ? null : 'no build: run npm run build first'),
	async run() {
		const server = await startServer({ demo: true });
		try {
			const client = await server.signIn('programmer@demo.test');
			const projects = (await (await client.get('/api/projects')).json()) as { projects: { id: number }[] };
			const pid = projects.projects[0].id;
			const signed = { cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ') };
			const subjects = {
				anonHealth: () => rps(server, '/api/health', {}),
				signedHealth: () => rps(server, '/api/health', signed),
				conflicts: () => rps(server, `/api/projects/${pid}/conflicts`, signed),
				page: () => rps(server, `/projects/${pid}/patch`, { ...signed, accept: 'text/html' })
			};
			const seen: Record<keyof typeof subjects, number[]> = {
				anonHealth: [],
				signedHealth: [],
				conflicts: [],
				page: []
			};
			// warm-up: JIT, the session cache, the computed patch
			for (const run of Object.values(subjects)) await run().then(() => undefined);
			for (let round = 0; round < ROUNDS; round++) {
				for (const [name, run] of Object.entries(subjects) as [keyof typeof subjects, () => Promise<number>][])
					seen[name].push(await run());
			}
			const m = Object.fromEntries(Object.entries(seen).map(([k, v]) => [k, median(v)])) as Record<
				keyof typeof subjects,
				number
			>;
			console.error(
				`requests (${CONNECTIONS} connections, median of ${ROUNDS} × ${SECONDS} s): anonymous health ${m.anonHealth.toFixed(0)}, ` +
					`signed health ${m.signedHealth.toFixed(0)}, signed conflicts ${m.conflicts.toFixed(0)}, patch page ${m.page.toFixed(0)} req/s`
			);
			const lines: BenchLine[] = [
				// ratio: signed-in conflicts against anonymous health; target ≥ 0.7
				{ name: 'api-signed-rps', value: m.conflicts, unit: 'req/s', ratio: m.conflicts / m.anonHealth },
				// ratio: the server-rendered patch page against the signed-in API read; target ≥ 0.5
				{ name: 'page-ssr-rps', value: m.page, unit: 'req/s', ratio: m.page / m.conflicts }
			];
			return lines;
		} finally {
			await server.stop();
		}
	}
};
