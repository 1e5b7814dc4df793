import { and, eq, sql } from 'drizzle-orm';
import { now } from '../clock';
import { DomainError } from '../errors';
import { db } from '../db/index';
import type { Project } from '../db/projects';
import { fixtures, fixtureTypes, modes, receivers, universes } from '../db/schema';
import type { BackupPreview } from '../../shapes';
import { checkBackup, restoreBackup } from './json';

// Restoring a backup (issue 16): a preview first — the restore run in a transaction that is rolled
// back, so what the preview counts is exactly what "Restore" writes — then the restore itself, under
// a name that says it is a copy so it is never mistaken for the original.
//
// The one seam with the backup check is `write()`: the check runs in the worker pool
// (json.ts checkBackup) and only the writes (restoreBackup) run on the request loop.

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

/** What restoring the file would create, or why it cannot; writes nothing. */
export async function previewRestore(userId: string, bytes: Uint8Array): Promise<BackupPreview> {
	let name = '';
	const base = () => ({ name, restoredName: name ? restoredName(name) : '', problems: [] });
	try {
		// decoding and every check run in the worker pool (json.ts); only the rolled-back writes run here
		const checked = await checkBackup(bytes, userId);
		name = checked.project.name;
		db().transaction(() => {
			throw new RolledBack(countsOf(restoreBackup(userId, checked).id));
		});
	} catch (e) {
		if (e instanceof RolledBack) return { ...base(), ok: true, message: '', counts: e.counts };
		if (!(e instanceof DomainError)) throw e;
		const issues = e.issues() ?? [];
		return {
			...base(),
			ok: false,
			message: e.message,
			counts: NONE,
			problems: issues
				.slice(0, PROBLEMS_SHOWN)
				.map((i) => ('path' in i ? { field: i.path.join('.'), message: i.message } : i))
		};
	}
	throw new Error('unreachable: the preview transaction always rolls back');
}

/** Restores the file as a new project owned by `userId`, named "<name> (restored <date>)". */
export async function restoreRenamed(userId: string, bytes: Uint8Array): Promise<Project> {
	const checked = await checkBackup(bytes, userId);
	const renamed = { ...checked, project: { ...checked.project, name: restoredName(checked.project.name) } };
	// restoreBackup writes in one transaction and answers the owner's view of the new project
	return restoreBackup(userId, renamed);
}
