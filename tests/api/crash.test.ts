import Database from 'better-sqlite3';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startServer } from '../helpers/server';
import { makeUser, PASSWORD } from '../helpers/factories';

// Crash safety: kill -9 the server in the middle of a burst of writes, start it
// again on the same file, and check nothing acknowledged was lost. SQLite in
// WAL mode with synchronous=FULL: a 2xx is sent only after the commit reached
// the disk, so even power loss keeps it (NORMAL would only survive a process crash).

const dir = mkdtempSync(join(tmpdir(), 'patchwright-crash-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('crash safety', () => {
	it('after SIGKILL mid-burst, the database is intact and every acknowledged write is there', async () => {
		const server = await startServer({ dir });
		const user = await makeUser(server.db());
		const client = await server.signIn(user.email!, PASSWORD);
		const acknowledged: { id: number; name: string }[] = [];
		let failed = 0;
		let stop = false;
		const lane = async (lane: number) => {
			for (let i = 0; !stop && i < 2000; i++) {
				const name = `burst ${lane}-${i}`;
				try {
					const res = await client.post('/api/projects', { name });
					if (res.status === 201) acknowledged.push({ id: (await res.json()).id, name });
				} catch {
					failed++; // the connection died with the server: not acknowledged
					return;
				}
			}
		};
		const lanes = Promise.all(Array.from({ length: 8 }, (_, i) => lane(i)));
		while (acknowledged.length < 40) await new Promise((r) => setTimeout(r, 20));
		server.process.kill('SIGKILL');
		stop = true;
		await lanes;
		await server.stop();
		expect(acknowledged.length).toBeGreaterThanOrEqual(40);

		const restarted = await startServer({ dir });
		try {
			const db = new Database(restarted.dbPath, { readonly: true });
			expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
			const stored = new Map(
				(db.prepare('select id, name from project').all() as { id: number; name: string }[]).map((r) => [r.id, r.name])
			);
			db.close();
			for (const a of acknowledged) expect(stored.get(a.id)).toBe(a.name);
			// and the restarted server works
			const again = await restarted.signIn(user.email!, PASSWORD);
			expect((await again.post('/api/projects', { name: 'after the crash' })).status).toBe(201);
			console.log(
				`crash test: ${acknowledged.length} writes acknowledged before SIGKILL, all present; ${failed} lanes cut off`
			);
		} finally {
			await restarted.stop();
		}
	});
});
