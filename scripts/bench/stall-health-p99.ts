// Issue 20: p99 of GET /api/health over 10 connections while a 20,000-row CSV preview and a
// 5,000-label sheet render run on the same server, against 250 ms (the idle p99 is printed too).
// The heavy jobs run in worker threads (src/lib/server/workers/); this is what shows they stay there.
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { resolve } from 'node:path';
import { addMember, makeProject, makeUser, PASSWORD } from '../../tests/helpers/factories';
import { channels, makeType } from '../../tests/helpers/patch-factories';
import { startServer, type Client } from '../../tests/helpers/server';
import type { BenchModule } from './harness';

interface CannonResult {
	latency: { p99: number; p50: number };
	requests: { total: number };
	non2xx: number;
	errors: number;
}
type Cannon = (o: { url: string; connections: number; duration: number }) => Promise<CannonResult>;
const autocannon = createRequire(import.meta.url)('autocannon') as Cannon;

const TARGET_MS = 250;
const SECONDS = 20;

function csv(rows: number): FormData {
	const perUniverse = Math.ceil(rows / 50);
	const lines = ['Number,Label,Maker,Model,Mode,Universe,Address'];
	for (let i = 0; i < rows; i++)
		lines.push(
			`${i + 1},Unit ${i + 1},Testworks,Bulk Par,Single,${Math.floor(i / perUniverse) + 1},${(i % perUniverse) + 1}`
		);
	const form = new FormData();
	form.set('file', new Blob([lines.join('\r\n')]), 'rig.csv');
	return form;
}

/**
 * Keeps one heavy request in flight until `until` resolves; counts the ones that finished and the
 * ones the worker budget stopped (422 too-slow: on a loaded machine a 5,000-label sheet can pass 30 s).
 */
async function keepBusy(
	what: string,
	until: Promise<unknown>,
	go: () => Promise<Response>
): Promise<{ done: number; stopped: number }> {
	let over = false;
	void until.then(() => (over = true));
	const n = { done: 0, stopped: 0 };
	while (!over) {
		const res = await go();
		const text = Buffer.from(await res.arrayBuffer()).toString();
		if (res.status === 422 && text.includes('"too-slow"')) n.stopped++;
		else if (res.status >= 300) throw new Error(`${what} answered ${res.status}: ${text.slice(0, 300)}`);
		else n.done++;
	}
	return n;
}

export const stallHealthP99: BenchModule = {
	name: 'stall-health-p99',
	benches: ['stall-health-p99'],
	skip: () => Promise.resolve(existsSync(resolve('build/index.js')) ? null : 'no build (run `npx vite build` first)'),
	async run() {
		const server = await startServer();
		try {
			const db = server.db();
			const user = await makeUser(db);
			const client: Client = await server.signIn(user.email!, PASSWORD);
			const setUp = () => {
				const p = makeProject(db);
				addMember(db, p.id, user.id, 'owner');
				makeType(db, p.id, { Single: channels(1) }, 'Bulk Par');
				return p.id;
			};
			const importing = setUp();
			const labelled = setUp();
			const applied = await client.fetch(`/api/projects/${labelled}/import?apply=true`, {
				method: 'POST',
				body: csv(5000)
			});
			if (applied.status !== 201) throw new Error(`seeding 5,000 fixtures answered ${applied.status}`);

			const health = (duration: number) => autocannon({ url: `${server.url}/api/health`, connections: 10, duration });
			await health(2); // warm-up
			const idle = await health(SECONDS / 2);

			const loaded = health(SECONDS);
			const [busy, imports, sheets] = await Promise.all([
				loaded,
				keepBusy('20,000-row preview', loaded, () =>
					client.fetch(`/api/projects/${importing}/import`, { method: 'POST', body: csv(20000) })
				),
				keepBusy('5,000-label sheet', loaded, () => client.get(`/api/projects/${labelled}/sheets/labels.pdf`))
			]);
			if (busy.non2xx || busy.errors) throw new Error(`health: ${busy.non2xx} non-2xx, ${busy.errors} errors`);
			console.error(
				`stall-health-p99: idle p99 ${idle.latency.p99} ms; under load p50 ${busy.latency.p50} ms, p99 ${busy.latency.p99} ms ` +
					`(${busy.requests.total} health answers; previews ${imports.done} finished, ${imports.stopped} stopped by the budget; ` +
					`label sheets ${sheets.done} finished, ${sheets.stopped} stopped; ` +
					`ratio to idle p99 ${(busy.latency.p99 / Math.max(1, idle.latency.p99)).toFixed(1)})`
			);
			return [{ name: 'stall-health-p99', value: busy.latency.p99, unit: 'ms', ratio: busy.latency.p99 / TARGET_MS }];
		} finally {
			await server.stop();
		}
	}
};
