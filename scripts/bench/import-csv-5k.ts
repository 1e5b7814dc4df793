// Issue 20: a 5,000-row CSV naming 50 new universes, previewed and applied through the built
// server (multipart upload, worker-thread parse, the app's checks and writes), against inserting
// the same universes and fixtures with raw prepared statements in one transaction. Target ratio ≤ 3.
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { addMember, makeProject, makeUser, PASSWORD } from '../../tests/helpers/factories';
import { channels, makeType } from '../../tests/helpers/patch-factories';
import { startServer, type TestServer } from '../../tests/helpers/server';
import { benchAgainst, type BenchModule } from './harness';

const ROWS = 5000;
const UNIVERSES = 50;
const PER_UNIVERSE = ROWS / UNIVERSES;

/** Row i: fixture i+1 of a one-slot type, 100 to a universe (ANSI E1.11: slots 1–512). */
const row = (i: number) => ({
	number: i + 1,
	universe: Math.floor(i / PER_UNIVERSE) + 1,
	address: (i % PER_UNIVERSE) + 1
});

export function csv5k(): string {
	const lines = ['Number,Label,Maker,Model,Mode,Universe,Address'];
	for (let i = 0; i < ROWS; i++) {
		const r = row(i);
		lines.push(`${r.number},Unit ${r.number},Testworks,Bulk Par,Single,${r.universe},${r.address}`);
	}
	return lines.join('\r\n');
}

function upload(text: string): FormData {
	const form = new FormData();
	form.set('file', new Blob([text]), 'rig.csv');
	return form;
}

async function run(server: TestServer) {
	const db = server.db();
	const user = await makeUser(db);
	const client = await server.signIn(user.email!, PASSWORD);
	const text = csv5k();
	/** each run gets an empty project with the type, so preview and apply always create 5,000 rows */
	const freshProject = () => {
		const p = makeProject(db);
		addMember(db, p.id, user.id, 'owner');
		const type = makeType(db, p.id, { Single: channels(1) }, 'Bulk Par');
		return { pid: p.id, type };
	};

	const raw = new Database(server.dbPath);
	raw.pragma('journal_mode = WAL');
	raw.pragma('foreign_keys = ON');
	const uni = raw.prepare('insert into universe (project_id, number) values (?, ?)');
	const fx = raw.prepare(
		"insert into fixture (project_id, number, label, type_id, mode_id, control_kind, universe_id, address) values (?, ?, ?, ?, ?, 'dmx', ?, ?)"
	);
	const insertAll = raw.transaction((pid: number, typeId: number, modeId: number) => {
		const ids: number[] = [];
		for (let u = 1; u <= UNIVERSES; u++) ids.push(Number(uni.run(pid, u).lastInsertRowid));
		for (let i = 0; i < ROWS; i++) {
			const r = row(i);
			fx.run(pid, r.number, `Unit ${r.number}`, typeId, modeId, ids[r.universe - 1], r.address);
		}
	});

	try {
		const r = await benchAgainst(
			async () => {
				const { pid } = freshProject();
				const preview = await client.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: upload(text) });
				const summary = (await preview.json()) as { create?: unknown[] };
				if (preview.status !== 200 || summary.create?.length !== ROWS)
					throw new Error(`preview answered ${preview.status}: ${JSON.stringify(summary).slice(0, 200)}`);
				const applied = await client.fetch(`/api/projects/${pid}/import?apply=true`, {
					method: 'POST',
					body: upload(text)
				});
				await applied.text();
				if (applied.status !== 201) throw new Error(`apply answered ${applied.status}`);
			},
			() => {
				const { pid, type } = freshProject();
				insertAll(pid, type.type.id, type.modeIds.Single);
			},
			{ runs: 5, warmup: 3 }
		);
		console.error(
			`import-csv-5k: preview + apply over HTTP ${r.subject.toFixed(0)} ms, raw prepared inserts ${r.baseline.toFixed(1)} ms`
		);
		return [{ name: 'import-csv-5k', value: r.subject, unit: 'ms', ratio: r.ratio }];
	} finally {
		raw.close();
	}
}

export const importCsv5k: BenchModule = {
	name: 'import-csv-5k',
	benches: ['import-csv-5k'],
	skip: () => Promise.resolve(existsSync(resolve('build/index.js')) ? null : 'no build (run `npx vite build` first)'),
	async run() {
		const server = await startServer();
		try {
			return await run(server);
		} finally {
			await server.stop();
		}
	}
};
