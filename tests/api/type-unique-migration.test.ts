import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../src/lib/server/db/index';
import { auditLog, fixtureTypes, fixtures, modes, projects } from '../../src/lib/server/db/schema';

// Migration 0004 (issue 16): a database written before maker + model became unique per project
// may hold duplicates; the migration must open it, merge nothing, rename the later types and say so.

const dirs: string[] = [];
const opened: Db[] = [];
const previous = process.env.MIGRATIONS_DIR;
afterEach(() => {
	for (const db of opened.splice(0)) db.$client.close();
	for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
	if (previous === undefined) delete process.env.MIGRATIONS_DIR;
	else process.env.MIGRATIONS_DIR = previous;
});

/** The migrations folder as it was before the unique index (journal entries before `tag`). */
function foldersBefore(tag: string): string {
	const dir = mkdtempSync(join(tmpdir(), 'patchwright-mig-'));
	dirs.push(dir);
	cpSync(resolve('drizzle'), dir, { recursive: true });
	const journalPath = join(dir, 'meta', '_journal.json');
	const journal = JSON.parse(readFileSync(journalPath, 'utf8')) as { entries: { idx: number; tag: string }[] };
	const cut = journal.entries.findIndex((e) => e.tag === tag);
	expect(cut).toBeGreaterThan(0);
	journal.entries = journal.entries.slice(0, cut);
	writeFileSync(journalPath, JSON.stringify(journal));
	return dir;
}

function open(path: string, migrations?: string): Db {
	if (migrations) process.env.MIGRATIONS_DIR = migrations;
	else delete process.env.MIGRATIONS_DIR;
	const db = openDatabase(path);
	opened.push(db);
	return db;
}

describe('migration: fixture type maker + model unique per project', () => {
	it('opens a database holding duplicates, renames the later ones "(2)", keeps their fixtures, and audits each rename', () => {
		const tag = JSON.parse(readFileSync(resolve('drizzle/meta/_journal.json'), 'utf8')).entries.find(
			(e: { tag: string }) => e.tag.endsWith('fixture-type-unique')
		).tag as string;
		const home = mkdtempSync(join(tmpdir(), 'patchwright-dup-'));
		dirs.push(home);
		const path = join(home, 'old.db');
		const old = open(path, foldersBefore(tag));
		const p = old.insert(projects).values({ name: 'Old show' }).returning().get();
		const other = old.insert(projects).values({ name: 'Other show' }).returning().get();
		const type = (projectId: number, maker: string, model: string) =>
			old.insert(fixtureTypes).values({ projectId, maker, model }).returning().get().id;
		const first = type(p.id, 'Testworks', 'Panel');
		const dup = type(p.id, 'TESTWORKS', 'panel');
		const taken = type(p.id, 'Testworks', 'Panel (2)'); // already holds the name a rename would take
		const dup2 = type(p.id, 'testworks', 'PANEL');
		const elsewhere = type(other.id, 'Testworks', 'Panel'); // another project may use the same pair
		const mode = old.insert(modes).values({ typeId: dup, name: '1ch', position: 0 }).returning().get();
		const fx = old
			.insert(fixtures)
			.values({ projectId: p.id, number: 1, typeId: dup, modeId: mode.id })
			.returning()
			.get();
		old.$client.close();
		opened.splice(0);

		const db = open(path);
		const names = new Map(
			db
				.select()
				.from(fixtureTypes)
				.all()
				.map((t) => [t.id, `${t.maker}|${t.model}`])
		);
		expect(names.get(first)).toBe('Testworks|Panel');
		expect(names.get(dup)).toBe('TESTWORKS|panel (2)');
		expect(names.get(elsewhere)).toBe('Testworks|Panel');
		// "testworks PANEL (3)" is free; the pre-existing "Panel (2)" met the renamed "panel (2)" and, being later, takes its id
		expect(names.get(dup2)).toBe('testworks|PANEL (3)');
		expect(names.get(taken)).toBe(`Testworks|Panel (2) (type ${taken})`);
		// nothing merged: the fixture stays on the type and mode it had
		expect(
			db
				.select()
				.from(fixtures)
				.all()
				.find((f) => f.id === fx.id)
		).toMatchObject({ typeId: dup, modeId: mode.id });
		const audit = db
			.select()
			.from(auditLog)
			.all()
			.filter((a) => a.action === 'type.rename-duplicate');
		expect(audit.map((a) => Number(a.entityId)).sort((a, b) => a - b)).toEqual(
			[dup, taken, dup2].sort((a, b) => a - b)
		);
		expect(audit.find((a) => Number(a.entityId) === dup)).toMatchObject({
			projectId: p.id,
			before: { maker: 'TESTWORKS', model: 'panel' },
			after: { maker: 'TESTWORKS', model: 'panel (2)', sameAs: first }
		});
		// and from now on the index refuses a case-folded duplicate (ASCII; the app also folds Unicode)
		expect(() => db.insert(fixtureTypes).values({ projectId: p.id, maker: 'testWORKS', model: 'panel' }).run()).toThrow(
			/UNIQUE/
		);
	});
});
