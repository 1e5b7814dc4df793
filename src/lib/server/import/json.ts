import { DomainError, UnprocessableError } from '../errors';
import { createFixtures } from '../db/fixtures';
import { db } from '../db/index';
import { createProject, projectShape, type Project } from '../db/projects';
import { createReceiver } from '../db/receivers';
import { createType } from '../db/fixture-types';
import { createUniverses } from '../db/universes';
import type { FixtureCreate } from '../../schemas/fixture';
import { runJob } from '../workers/pool';
import type { CheckedBackup } from './json-check';
import type { ImportIssue } from './gdtf';

export type { CheckedBackup } from './json-check';

// A project backup (export/json.ts) read back into a NEW project. The check (json-check.ts) runs
// in a worker thread with the pool's budgets; only the writes run here, in one transaction, with
// the ids in the file mapped to the new rows' ids.

/**
 * The one check of a backup's bytes, for the restore route and any preview of a restore: decoded,
 * parsed and validated off the request loop; a job over its time or memory budget answers 422/413.
 */
export function checkBackup(bytes: Uint8Array, owner: string): Promise<CheckedBackup> {
	return runJob<CheckedBackup>({ kind: 'json-backup', bytes }, 'Checking the project backup', owner);
}

/** Writes a checked backup as a new project owned by the user; a refused write leaves nothing. */
export function restoreBackup(userId: string, checked: CheckedBackup): Project {
	const { universes, types, receivers, fixtures } = checked;
	return db().transaction(() => {
		const created = createProject(userId, checked.project);
		const pid = created.id;
		const universeMap = new Map<number, number>();
		const made = createUniverses(
			pid,
			userId,
			universes.map((u) => u.data!)
		);
		universes.forEach((u, i) => universeMap.set(u.id, made[i].id));
		const typeMap = new Map<number, number>();
		const modeMap = new Map<number, number>();
		for (const t of types) {
			const shape = createType(pid, userId, t.data!);
			typeMap.set(t.id, shape.id);
			// createType keeps the modes' order
			t.modeIds.forEach((old, i) => modeMap.set(old, shape.modes[i].id));
		}
		const receiverMap = new Map<number, number>();
		for (const r of receivers) receiverMap.set(r.id, createReceiver(pid, userId, r.data!).id);
		const fixtureMap = new Map<number, number>();
		const missing: ImportIssue[] = [];
		const remap = (f: (typeof fixtures)[number]): FixtureCreate => {
			const d = f.data!;
			const need = (map: Map<number, number>, id: number, field: string) => {
				const to = map.get(id);
				if (to === undefined)
					missing.push({
						row: null,
						field: `fixtures.${f.index}.${field}`,
						message: `Refers to id ${id}, which the file does not contain.`
					});
				return to ?? id;
			};
			const c = d.control;
			const control =
				c.kind === 'dmx' || c.kind === 'dmx-map'
					? { ...c, universeId: need(universeMap, c.universeId, 'control.universeId') }
					: c.kind === 'rc'
						? { ...c, receiverId: need(receiverMap, c.receiverId, 'control.receiverId') }
						: c.kind === 'follow'
							? { ...c, leaderId: need(fixtureMap, c.leaderId, 'control.leaderId') }
							: c;
			return { ...d, typeId: need(typeMap, d.typeId, 'typeId'), modeId: need(modeMap, d.modeId, 'modeId'), control };
		};
		// leaders first, so followers can point at their new ids
		for (const batch of [
			fixtures.filter((f) => f.data!.control.kind !== 'follow'),
			fixtures.filter((f) => f.data!.control.kind === 'follow')
		]) {
			if (batch.length === 0) continue;
			const inputs = batch.map(remap);
			if (missing.length)
				throw new UnprocessableError('The file refers to rows it does not contain; nothing was created.', missing, {
					code: 'invalid-file'
				});
			let made;
			try {
				made = createFixtures(pid, userId, inputs);
			} catch (e) {
				if (!(e instanceof DomainError)) throw e;
				const list = e.issues() ?? [];
				throw new UnprocessableError(
					`A fixture in the file is not valid here: ${e.message}`,
					list.map((i) => {
						if (!('path' in i)) return i;
						const at = batch.length > 1 && typeof i.path[0] === 'number' ? i.path[0] : 0;
						const rest = batch.length > 1 ? i.path.slice(1) : i.path;
						return { row: null, field: ['fixtures', batch[at].index, ...rest].join('.'), message: i.message };
					}),
					{ code: 'invalid-file' }
				);
			}
			batch.forEach((f, i) => fixtureMap.set(f.id, made[i].id));
		}
		return projectShape(created, 'owner');
	});
}
