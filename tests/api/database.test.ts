import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../src/lib/server/db/index';
import { fixtures, projects, users, fixtureTypes, universes } from '../../src/lib/server/db/schema';
import { DEMO_USERS, seedDemo } from '../../src/lib/server/demo';

const opened: { db: Db; dir: string }[] = [];
function fresh(): Db {
	const dir = mkdtempSync(join(tmpdir(), 'patchwright-db-'));
	const db = openDatabase(join(dir, 'fresh.db'));
	opened.push({ db, dir });
	return db;
}
afterEach(() => {
	for (const { db, dir } of opened.splice(0)) {
		db.$client.close();
		rmSync(dir, { recursive: true, force: true });
	}
});

const count = (
	db: Db,
	table: typeof projects | typeof users | typeof fixtures | typeof fixtureTypes | typeof universes
) =>
	db
		.select({ n: sql<number>`count(*)` })
		.from(table)
		.get()!.n;

describe('migrations on an empty database', () => {
	it('create every table of the data model, with foreign keys on and WAL', () => {
		const db = fresh();
		const tables = db.$client
			.prepare(
				"select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like '__drizzle%'"
			)
			.pluck()
			.all() as string[];
		for (const t of [
			'user',
			'account',
			'session',
			'verificationToken',
			'project',
			'membership',
			'invitation',
			'universe',
			'fixture_type',
			'mode',
			'mode_channel',
			'fixture',
			'receiver',
			'receiver_label',
			'upload',
			'revision',
			'review_link',
			'signoff',
			'audit_log',
			'mail_outbox'
		]) {
			expect(tables).toContain(t);
		}
		expect(db.$client.pragma('foreign_keys', { simple: true })).toBe(1);
		expect(db.$client.pragma('journal_mode', { simple: true })).toBe('wal');
		// synchronous=FULL is 2
		expect(db.$client.pragma('synchronous', { simple: true })).toBe(2);
		const indexes = db.$client.prepare("select name from sqlite_master where type = 'index'").pluck().all();
		expect(indexes).toContain('fixture_project_universe_address');
	});

	it('are idempotent: opening the same file again applies nothing twice', () => {
		const dir = mkdtempSync(join(tmpdir(), 'patchwright-db-'));
		const path = join(dir, 'again.db');
		openDatabase(path).$client.close();
		const db = openDatabase(path);
		opened.push({ db, dir });
		const applied = db.$client.prepare('select count(*) from __drizzle_migrations').pluck().get();
		expect(applied).toBeGreaterThanOrEqual(1);
	});

	it('enforce foreign keys (a fixture cannot point at a missing mode)', () => {
		const db = fresh();
		const project = db.insert(projects).values({ name: 'p' }).returning().get();
		expect(() =>
			db.insert(fixtures).values({ projectId: project.id, number: 1, typeId: 999, modeId: 999 }).run()
		).toThrow(/FOREIGN KEY/);
	});
});

describe('demo seed', () => {
	it('creates the demo users, universes, ~40 fixtures of 4–5 types, and is idempotent', async () => {
		const db = fresh();
		const first = await seedDemo(db);
		expect(first.created).toBe(true);
		const counts = {
			projects: count(db, projects),
			users: count(db, users),
			fixtures: count(db, fixtures),
			types: count(db, fixtureTypes),
			universes: count(db, universes)
		};
		expect(counts.users).toBe(DEMO_USERS.length);
		expect(counts.fixtures).toBeGreaterThanOrEqual(38);
		expect(counts.fixtures).toBeLessThanOrEqual(50);
		expect(counts.types).toBeGreaterThanOrEqual(4);
		expect(counts.universes).toBeGreaterThanOrEqual(3);

		const second = await seedDemo(db);
		expect(second).toEqual({ projectId: first.projectId, created: false });
		expect({
			projects: count(db, projects),
			users: count(db, users),
			fixtures: count(db, fixtures),
			types: count(db, fixtureTypes),
			universes: count(db, universes)
		}).toEqual(counts);
	});

	it('includes every kind of control the demo is meant to show', async () => {
		const db = fresh();
		await seedDemo(db);
		const kinds = db.$client.prepare('select distinct control_kind from fixture').pluck().all();
		expect(new Set(kinds)).toEqual(new Set(['dmx', 'dmx-map', 'rc', 'follow', 'manual']));
		const linked = db.$client.prepare('select count(*) from fixture where link_group is not null').pluck().get();
		expect(linked).toBeGreaterThanOrEqual(2);
	});
});
