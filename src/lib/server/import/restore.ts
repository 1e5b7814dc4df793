import { and, eq, sql } from 'drizzle-orm';
import { now } from '../clock';
import { DomainError, UnprocessableError } from '../errors';
import { db } from '../db/index';
import { getProject, projectShape, updateProject, type Project } from '../db/projects';
import { fixtures, fixtureTypes, modes, receivers, universes } from '../db/schema';
import type { BackupPreview } from '../../shapes';
import { importProjectJson } from './json';
import { decodeText } from './limits';

// Restoring a backup (issue 16): a preview first — the restore run in a transaction that is rolled
// back, so what the preview counts is exactly what "Restore" writes — then the restore itself, under
// a name that says it is a copy so it is never mistaken for the original.
//
// The one seam with the backup check is `write()`: here importProjectJson checks and writes in one
// call; where the check runs in a worker (json.ts checkBackup → restoreBackup), write() becomes
// `restoreBackup(userId, await checkBackup(bytes))` and the rest stays.

const NAME_MAX = 120;
const PROBLEMS_SHOWN = 50;

/** "<name> (restored 2026-12-02)", the name shortened so the whole fits the 120-character limit. */
export function restoredName(name: string, at: number = now()): string {
	const suffix = ` (restored ${new Date(at).toISOString().slice(0, 10)})`;
	return `${name
		.trim()
		.slice(0, NAME_MAX - suffix.length)
		.trimEnd()}${suffix}`;
}

const SECTIONS = ['universes', 'types', 'fixtures'] as const;

/**
 * A file that is JSON but not a whole backup: a bare name, or a project with none of the lists an
 * export always writes (an empty project's export still has them, empty). Answers the sentence, or ''.
 */
function junk(raw: unknown): string {
	if (raw === null || typeof raw !== 'object' || Array.isArray(raw))
		return 'This file is not a project backup: it holds no project, only a single value or a list.';
	const o = raw as Record<string, unknown>;
	const missing = SECTIONS.filter((k) => !Array.isArray(o[k]));
	if (missing.length === SECTIONS.length)
		return 'This file is not a project backup: it has no universes, fixture types or fixtures lists, which every export writes (empty ones included).';
	return '';
}

function nameIn(raw: unknown): string {
	const p = (raw as { project?: { name?: unknown } } | null)?.project;
	return typeof p?.name === 'string' ? p.name : '';
}

function countsOf(projectId: number): BackupPreview['counts'] {
	const n = (table: typeof universes | typeof fixtureTypes | typeof fixtures | typeof receivers) =>
		db()
			.select({ n: sql<number>`count(*)` })
			.from(table)
			.where(eq(table.projectId, projectId))
			.get()!.n;
	const modeCount = db()
		.select({ n: sql<number>`count(*)` })
		.from(modes)
		.innerJoin(fixtureTypes, and(eq(modes.typeId, fixtureTypes.id), eq(fixtureTypes.projectId, projectId)))
		.get()!.n;
	return {
		universes: n(universes),
		types: n(fixtureTypes),
		modes: modeCount,
		fixtures: n(fixtures),
		receivers: n(receivers)
	};
}

const NONE = { universes: 0, types: 0, modes: 0, fixtures: 0, receivers: 0 };

class RolledBack extends Error {
	constructor(readonly counts: BackupPreview['counts']) {
		super('preview rolled back');
	}
}

function parse(bytes: Uint8Array): { raw?: unknown; sentence: string } {
	let raw: unknown;
	try {
		raw = JSON.parse(decodeText(bytes));
	} catch {
		return { sentence: 'This file is not a project backup: it is not JSON.' };
	}
	return { raw, sentence: junk(raw) };
}

/** Checks the file and writes it as a new project (in the caller's transaction). */
async function write(userId: string, bytes: Uint8Array): Promise<() => Project> {
	const text = decodeText(bytes);
	return () => importProjectJson(userId, text);
}

/** What restoring the file would create, or why it cannot; writes nothing. */
export async function previewRestore(userId: string, bytes: Uint8Array): Promise<BackupPreview> {
	const { raw, sentence } = parse(bytes);
	const name = nameIn(raw);
	const base = { name, restoredName: name ? restoredName(name) : '', counts: NONE, problems: [] };
	if (sentence) return { ...base, ok: false, message: sentence };
	try {
		const run = await write(userId, bytes);
		db().transaction(() => {
			throw new RolledBack(countsOf(run().id));
		});
	} catch (e) {
		if (e instanceof RolledBack) return { ...base, ok: true, message: '', counts: e.counts };
		if (!(e instanceof DomainError)) throw e;
		const issues = e.issues() ?? [];
		return {
			...base,
			ok: false,
			message: e.message,
			problems: issues
				.slice(0, PROBLEMS_SHOWN)
				.map((i) => ('path' in i ? { field: i.path.join('.'), message: i.message } : i))
		};
	}
	throw new Error('unreachable: the preview transaction always rolls back');
}

/** Restores the file as a new project owned by `userId`, named "<name> (restored <date>)". */
export async function restoreRenamed(userId: string, bytes: Uint8Array): Promise<Project> {
	const { sentence } = parse(bytes);
	if (sentence) throw new UnprocessableError(sentence, undefined, { code: 'invalid-file' });
	const run = await write(userId, bytes);
	return db().transaction(() => {
		const p = run();
		updateProject(p.id, userId, { name: restoredName(p.name), version: p.version });
		return projectShape(getProject(p.id)!, 'owner');
	});
}
