import { and, asc, eq, or, sql } from 'drizzle-orm';
import { DuplicateError, InUseError, NotFoundError, StaleVersionError } from '../errors';
import { INSERT_CHUNK, recordAudit, recordAuditMany } from './audit';
import { db } from './index';
import { controlColumns, loadPatchCached, universeShape, type UniverseShape } from './patch';
import { fixtures, universes } from './schema';
import type { UniverseCreate, UniversePatch } from '../../schemas/universe';

export type { UniverseWithNumbers } from '../../shapes';
import type { UniverseWithNumbers } from '../../shapes';

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

/**
 * Many universes in one statement per chunk (imports, restores): no computed patch per row, which
 * made a file naming N new universes cost N patch computations. Numbers must be new to the project.
 */
export function createUniverses(projectId: number, userId: string, inputs: UniverseCreate[]): UniverseShape[] {
	if (inputs.length === 0) return [];
	return db().transaction(() => {
		const taken = new Set(
			db()
				.select({ number: universes.number })
				.from(universes)
				.where(eq(universes.projectId, projectId))
				.all()
				.map((u) => u.number)
		);
		for (const u of inputs) {
			if (taken.has(u.number)) throw duplicate(u.number);
			taken.add(u.number);
		}
		const rows: UniverseShape[] = [];
		for (let i = 0; i < inputs.length; i += INSERT_CHUNK) {
			const chunk = inputs.slice(i, i + INSERT_CHUNK).map((u) => ({ projectId, ...u }));
			// RETURNING's order is unspecified; ids are handed out in insert order
			const made = db().insert(universes).values(chunk).returning().all();
			rows.push(...made.sort((a, b) => a.id - b.id).map(universeShape));
		}
		recordAuditMany(
			rows.map((u) => ({ projectId, userId, action: 'universe.create', entity: 'universe', entityId: u.id, after: u }))
		);
		return rows;
	});
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
		// a fixture uses the universe through break 1 (universe_id) or any further DMX break (break_addresses)
		const users = db()
			.select()
			.from(fixtures)
			.where(
				and(
					eq(fixtures.projectId, projectId),
					or(eq(fixtures.universeId, id), sql`${fixtures.breakAddresses} is not null`)
				)
			)
			.orderBy(asc(fixtures.number))
			.all()
			.filter((f) => f.universeId === id || (f.breakAddresses ?? []).some((b) => b.universeId === id));
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
			breakAddresses: f.breakAddresses,
			addressMap: f.addressMap,
			receiverId: f.receiverId,
			rcChannels: f.rcChannels,
			leaderId: f.leaderId
		},
		after: { controlKind: 'manual', reason: why }
	});
}
