import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { fingerprint } from '../helpers/fingerprint';
import { startServer, type TestServer } from '../helpers/server';

// Issue 20: a CSV import now writes from a worker thread on its own connection, so a write request
// can meet the write lock held by another connection. Past SQLite's busy_timeout (5 s) it answers
// 503 in the error shape, writing nothing — never an HTML 500.

let server: TestServer;
let pid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;

beforeAll(async () => {
	server = await startServer();
	const { project, crew, outsider } = await makeCrew(server.db());
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
});
afterAll(() => server?.stop());

describe('a write that meets a held write lock', () => {
	it('answers 503 busy as JSON, writes nothing, and writes again once the lock is gone', async () => {
		const holder = new Database(server.dbPath);
		holder.pragma('busy_timeout = 5000');
		const before = fingerprint(server.db(), pid);
		holder.exec('BEGIN IMMEDIATE');
		let res: Response;
		try {
			res = await as.programmer.post(`/api/projects/${pid}/universes`, { number: 7, name: 'Held' });
		} finally {
			holder.exec('ROLLBACK');
			holder.close();
		}
		expect(res.status).toBe(503);
		const body = await res.json();
		expect(body.error.code).toBe('busy');
		expect(body.error.message).toContain('nothing was changed');
		expect(fingerprint(server.db(), pid)).toBe(before);
		expect((await as.programmer.post(`/api/projects/${pid}/universes`, { number: 7, name: 'Free' })).status).toBe(201);
	}, 30_000);

	it('a form action answers a 503 failure the page can show, keeping the input', async () => {
		const holder = new Database(server.dbPath);
		holder.exec('BEGIN IMMEDIATE');
		let res: Response;
		try {
			const form = new FormData();
			form.set('number', '8');
			form.set('name', 'Held too');
			res = await as.programmer.fetch(`/projects/${pid}/universes?/create`, {
				method: 'POST',
				headers: { accept: 'application/json', 'x-sveltekit-action': 'true' },
				body: form
			});
		} finally {
			holder.exec('ROLLBACK');
			holder.close();
		}
		const body = await res.json();
		expect(body).toMatchObject({ type: 'failure', status: 503 });
		expect(body.data).toContain('nothing was changed');
		expect(body.data).toContain('Held too');
	}, 30_000);
});
