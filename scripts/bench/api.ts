// JSON API benches against the built server: the whole patch of a 20,000-fixture project over
// HTTP (against reading the same rows in-process), and conflicts throughput under load.
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { resolve } from 'node:path';
import { makeUser, PASSWORD } from '../../tests/helpers/factories';
import { startServer, type TestServer } from '../../tests/helpers/server';
import { benchAgainst, type BenchLine, type BenchModule } from './harness';

interface CannonResult {
	requests: { average: number };
	non2xx: number;
	errors: number;
}
type Cannon = (o: {
	url: string;
	connections: number;
	duration: number;
	headers?: Record<string, string>;
}) => Promise<CannonResult>;
const autocannon = createRequire(import.meta.url)('autocannon') as Cannon;

const FIXTURES = 20_000;
const PER_UNIVERSE = 100;

/** Raw inserts in one transaction: 200 universes of 100 four-slot fixtures, one type. */
function seedBig(path: string, userId: string): number {
	const sqlite = new Database(path);
	try {
		return sqlite.transaction(() => {
			const pid = Number(sqlite.prepare("insert into project (name) values ('Bench rig')").run().lastInsertRowid);
			sqlite.prepare("insert into membership (project_id, user_id, role) values (?, ?, 'owner')").run(pid, userId);
			const typeId = Number(
				sqlite.prepare("insert into fixture_type (project_id, maker, model) values (?, 'Bench', 'Panel')").run(pid)
					.lastInsertRowid
			);
			const modeId = Number(
				sqlite.prepare("insert into mode (type_id, name) values (?, 'HSIC')").run(typeId).lastInsertRowid
			);
			const ch = sqlite.prepare(
				'insert into mode_channel (mode_id, position, offset, parameter, bits) values (?, ?, ?, ?, ?)'
			);
			ch.run(modeId, 0, 1, 'intensity', 16);
			ch.run(modeId, 1, 3, 'hue', 8);
			ch.run(modeId, 2, 4, 'cct', 8);
			const uni = sqlite.prepare("insert into universe (project_id, number, transport) values (?, ?, 'sacn')");
			const fx = sqlite.prepare(
				"insert into fixture (project_id, number, label, type_id, mode_id, control_kind, universe_id, address, position, group_name) values (?, ?, ?, ?, ?, 'dmx', ?, ?, 'truss', 'wash')"
			);
			for (let u = 0; u < FIXTURES / PER_UNIVERSE; u++) {
				const uid = Number(uni.run(pid, u + 1).lastInsertRowid);
				for (let k = 0; k < PER_UNIVERSE; k++) {
					const n = u * PER_UNIVERSE + k + 1;
					fx.run(pid, n, `FX ${n}`, typeId, modeId, uid, 1 + k * 4);
				}
			}
			return pid;
		})();
	} finally {
		sqlite.close();
	}
}

async function patch20k(server: TestServer): Promise<BenchLine[]> {
	const user = await makeUser(server.db());
	const pid = seedBig(server.dbPath, user.id);
	const client = await server.signIn(user.email!, PASSWORD);
	const reader = new Database(server.dbPath);
	const rows = reader.prepare('select * from fixture where project_id = ? order by number');
	// a committed write from another connection: the server's cached patch must be recomputed
	const touch = reader.prepare('update project set notes = notes where id = ?');
	try {
		const first = await client.get(`/api/projects/${pid}/patch`);
		const body = (await first.json()) as { fixtures: unknown[] };
		if (first.status !== 200 || body.fixtures.length !== FIXTURES)
			throw new Error(`GET patch answered ${first.status} with ${body.fixtures.length} fixtures`);
		const r = await benchAgainst(
			async () => {
				const res = await client.get(`/api/projects/${pid}/patch`);
				await res.text();
			},
			() => JSON.stringify(rows.all(pid)),
			{ runs: 11, warmup: 3 }
		);
		console.error(`api-patch-20k: HTTP ${r.subject.toFixed(1)} ms, in-process rows + JSON ${r.baseline.toFixed(1)} ms`);
		// after every edit: nothing cached; the same write is timed on both sides
		const cold = await benchAgainst(
			async () => {
				touch.run(pid);
				const res = await client.get(`/api/projects/${pid}/patch`);
				await res.text();
			},
			() => {
				touch.run(pid);
				return JSON.stringify(rows.all(pid));
			},
			{ runs: 11, warmup: 3 }
		);
		console.error(`api-patch-20k-cold: HTTP ${cold.subject.toFixed(1)} ms, in-process ${cold.baseline.toFixed(1)} ms`);
		return [
			{ name: 'api-patch-20k', value: r.subject, unit: 'ms', ratio: r.ratio },
			{ name: 'api-patch-20k-cold', value: cold.subject, unit: 'ms', ratio: cold.ratio }
		];
	} finally {
		reader.close();
	}
}

async function conflictsRps(server: TestServer): Promise<BenchLine> {
	const client = await server.signIn('viewer@demo.test');
	const projects = (await (await client.get('/api/projects')).json()) as { projects: { id: number }[] };
	const pid = projects.projects[0].id;
	const headers = { cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ') };
	const run = async (path: string) => {
		const r = await autocannon({ url: `${server.url}${path}`, connections: 50, duration: 5, headers });
		if (r.non2xx > 0 || r.errors > 0) throw new Error(`${path}: ${r.non2xx} non-2xx, ${r.errors} errors under load`);
		console.error(`${path}: ${r.requests.average} req/s`);
		return r.requests.average;
	};
	await run(`/api/projects/${pid}/conflicts`); // warm-up
	const health = await run('/api/health');
	const conflicts = await run(`/api/projects/${pid}/conflicts`);
	return { name: 'api-conflicts-rps', value: conflicts, unit: 'req/s', ratio: conflicts / health };
}

export const api: BenchModule = {
	name: 'api',
	benches: ['api-patch-20k', 'api-patch-20k-cold', 'api-conflicts-rps'],
	skip: () => Promise.resolve(existsSync(resolve('build/index.js')) ? null : 'no build (run `npx vite build` first)'),
	async run(options) {
		const lines: BenchLine[] = [];
		const want = (name: string) => options?.filter === undefined || name.includes(options.filter);
		const server = await startServer({ demo: true });
		try {
			if (want('api-conflicts-rps')) lines.push(await conflictsRps(server));
			if (want('api-patch-20k')) lines.push(...(await patch20k(server)));
		} finally {
			await server.stop();
		}
		return lines;
	}
};
