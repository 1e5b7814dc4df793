import { and, asc, eq, sql } from 'drizzle-orm';
import { recordAudit } from './audit';
import { DuplicateError, InUseError, NotFoundError, StaleVersionError } from '../errors';
import { db } from './index';
import { controlColumns, loadPatchCached, universeShape, type PatchData } from './patch';
import { fixtures, universes } from './schema';
import type { UniverseCreate, UniversePatch } from '../../schemas/universe';

export type UniverseWithNumbers = PatchData['universes'][number];

/** Universes with their computed sACN/Art-Net numbers, slots used and refresh (DESIGN "universe"). */
export function listUniversesComputed(projectId: number): UniverseWithNumbers[] {
	return loadPatchCached(projectId).universes;
}

export function getUniverseComputed(projectId: number, id: number): UniverseWithNumbers | undefined {
	return listUniversesComputed(projectId).find((u) => u.id === id);
}

export function universeRow(projectId: number, id: number) {
	return db()
		.select()
		.from(universes)
		.where(and(eq(universes.id, id), eq(universes.projectId, projectId)))
		.get();
}

function requireUniverse(projectId: number, id: number) {
	const row = universeRow(projectId, id);
	if (!row) throw new NotFoundError('No such universe in this project.');
	return row;
}

function numberTaken(projectId: number, number: number, exceptId?: number): boolean {
	const row = db()
		.select({ id: universes.id })
		.from(universes)
		.where(and(eq(universes.projectId, projectId), eq(universes.number, number)))
		.get();
	return row !== undefined && row.id !== exceptId;
}

function duplicate(number: number): DuplicateError {
	return new DuplicateError(`Universe ${number} already exists in this project.`, [
		{ path: ['number'], message: `Universe ${number} already exists.` }
	]);
}

export function createUniverse(projectId: number, userId: string, input: UniverseCreate): UniverseWithNumbers {
	const id = db().transaction(() => {
		if (numberTaken(projectId, input.number)) throw duplicate(input.number);
		const row = db()
			.insert(universes)
			.values({ projectId, ...input })
			.returning()
			.get();
		recordAudit({
			projectId,
			userId,
			action: 'universe.create',
			entity: 'universe',
			entityId: row.id,
			after: universeShape(row)
		});
		return row.id;
	});
	return getUniverseComputed(projectId, id)!;
}

export function updateUniverse(
	projectId: number,
	userId: string,
	id: number,
	patch: UniversePatch
): UniverseWithNumbers {
	db().transaction(() => {
		const before = requireUniverse(projectId, id);
		const { version, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(getUniverseComputed(projectId, id));
		if (fields.number !== undefined && numberTaken(projectId, fields.number, id)) throw duplicate(fields.number);
		// The version in the WHERE makes check-and-write one statement: of two writers with the same version, one changes a row.
		const after = db()
			.update(universes)
			.set({ ...fields, version: sql`${universes.version} + 1`, updatedAt: new Date() })
			.where(and(eq(universes.id, id), eq(universes.projectId, projectId), eq(universes.version, version)))
			.returning()
			.get();
		if (!after) throw new StaleVersionError(getUniverseComputed(projectId, id));
		recordAudit({
			projectId,
			userId,
			action: 'universe.update',
			entity: 'universe',
			entityId: id,
			before: universeShape(before),
			after: universeShape(after)
		});
	});
	return getUniverseComputed(projectId, id)!;
}

/** Refuses while fixtures use the universe, unless `detach`: then they become manual (nothing is lost; the audit keeps their old control). */
export function deleteUniverse(projectId: number, userId: string, id: number, detach: boolean): void {
	db().transaction(() => {
		const before = requireUniverse(projectId, id);
		const users = db()
			.select()
			.from(fixtures)
			.where(and(eq(fixtures.projectId, projectId), eq(fixtures.universeId, id)))
			.orderBy(asc(fixtures.number))
			.all();
		if (users.length > 0 && !detach) {
			throw new InUseError(
				`Universe ${before.number} is used by ${users.length === 1 ? 'fixture' : 'fixtures'} ${users.map((f) => f.number).join(', ')}; move them first or delete with ?detach=true to set them to manual.`,
				users.map((f) => ({ id: f.id, number: f.number, label: f.label }))
			);
		}
		for (const f of users) detachFixture(projectId, userId, f, `universe ${before.number} deleted`);
		db().delete(universes).where(eq(universes.id, id)).run();
		recordAudit({
			projectId,
			userId,
			action: 'universe.delete',
			entity: 'universe',
			entityId: id,
			before: universeShape(before)
		});
	});
}

/** Sets a fixture to manual control, bumping its version; shared by the deletes that detach. */
export function detachFixture(projectId: number, userId: string, f: typeof fixtures.$inferSelect, why: string): void {
	db()
		.update(fixtures)
		.set({ ...controlColumns({ kind: 'manual' }), version: sql`${fixtures.version} + 1`, updatedAt: new Date() })
		.where(eq(fixtures.id, f.id))
		.run();
	recordAudit({
		projectId,
		userId,
		action: 'fixture.detach',
		entity: 'fixture',
		entityId: f.id,
		before: {
			controlKind: f.controlKind,
			universeId: f.universeId,
			address: f.address,
			addressMap: f.addressMap,
			receiverId: f.receiverId,
			rcChannels: f.rcChannels,
			leaderId: f.leaderId
		},
		after: { controlKind: 'manual', reason: why }
	});
}
