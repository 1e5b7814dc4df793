import Database from 'better-sqlite3';
import { execFile } from 'node:child_process';
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { makeUser, PASSWORD } from '../helpers/factories';

const run = promisify(execFile);
let server: TestServer;
const scratch = mkdtempSync(join(tmpdir(), 'patchwright-backup-'));

beforeAll(async () => {
	server = await startServer({ demo: true });
});
afterAll(async () => {
	await server?.stop();
	rmSync(scratch, { recursive: true, force: true });
});

describe('npm run backup (SQLite online backup through better-sqlite3)', () => {
	it('copies the live database consistently while writes go on, and the copy restores', async () => {
		const user = await makeUser(server.db());
		const client = await server.signIn(user.email!, PASSWORD);
		// writes keep landing while the backup runs
		let writing = true;
		const writer = (async () => {
			let n = 0;
			while (writing) {
				const res = await client.post('/api/projects', { name: `During backup ${n++}` });
				expect(res.status).toBe(201);
			}
			return n;
		})();
		await new Promise((r) => setTimeout(r, 200));
		const target = join(scratch, 'copy.db');
		const { stdout } = await run(process.execPath, ['--import', 'tsx', resolve('scripts/backup.ts'), target], {
			env: { ...process.env, DATABASE_URL: server.dbPath }
		});
		writing = false;
		const written = await writer;
		expect(written).toBeGreaterThan(0);
		expect(stdout).toContain('integrity ok');

		const copy = new Database(target, { readonly: true });
		expect(copy.pragma('integrity_check', { simple: true })).toBe('ok');
		const demoFixtures = copy.prepare('select count(*) from fixture').pluck().get() as number;
		expect(demoFixtures).toBe(46);
		copy.close();

		// restore, as documented: stop the server, put the copy in place of the file, start again
		const restoredDir = mkdtempSync(join(scratch, 'restored-'));
		copyFileSync(target, join(restoredDir, 'test.db'));
		const restored = await startServer({ dir: restoredDir });
		try {
			const owner = await restored.signIn('owner@demo.test');
			const projects = (await (await owner.get('/api/projects')).json()).projects as { name: string }[];
			expect(projects.map((p) => p.name)).toContain('The Lantern Ferry — river unit');
		} finally {
			await restored.stop();
		}
	});
});
