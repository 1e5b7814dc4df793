import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { recordAudit } from './audit';
import { DuplicateError, InUseError, InvalidError, NotFoundError, StaleVersionError } from '../errors';
import { db } from './index';
import { listTypes, type TypeShape } from './patch';
import { fixtureTypes, fixtures, modeChannels, modes } from './schema';
import { updateFixtures } from './fixtures';
import type { FixtureMove, ModeInput, TypeCreate, TypePatch } from '../../schemas/type';

export function getType(projectId: number, id: number): TypeShape | undefined {
	return listTypes(projectId, [id])[0];
}

function requireRow(projectId: number, id: number) {
	const row = db()
		.select()
		.from(fixtureTypes)
		.where(and(eq(fixtureTypes.id, id), eq(fixtureTypes.projectId, projectId)))
		.get();
	if (!row) throw new NotFoundError('No such fixture type in this project.');
	return row;
}

function writeChannels(modeId: number, mode: ModeInput): void {
	db().delete(modeChannels).where(eq(modeChannels.modeId, modeId)).run();
	if (mode.channels.length === 0) return;
	db()
		.insert(modeChannels)
		.values(
			mode.channels.map((c, position) => ({
				modeId,
				position,
				offset: c.offset,
				parameter: c.parameter,
				bits: c.bits,
				defaultValue: c.default,
				min: c.min ?? null,
				max: c.max ?? null,
				unit: c.unit ?? null,
				dmxFrom: c.dmxFrom ?? null,
				dmxTo: c.dmxTo ?? null,
				dmxBreak: c.dmxBreak ?? 1,
				fineOffsets: c.fineOffsets !== undefined && c.fineOffsets.length > 0 ? c.fineOffsets : null
			}))
		)
		.run();
}

/** Power data of a mode (issue 15): draw at full and accepted input voltage. */
function modePower(mode: ModeInput) {
	return {
		watts: mode.watts ?? null,
		inputVoltsMin: mode.inputVolts?.min ?? null,
		inputVoltsMax: mode.inputVolts?.max ?? null
	};
}

function insertMode(typeId: number, mode: ModeInput, position: number): void {
	const row = db()
		.insert(modes)
		.values({ typeId, name: mode.name, position, ...modePower(mode) })
		.returning({ id: modes.id })
		.get();
	writeChannels(row.id, mode);
}

function fixturesUsing(column: typeof fixtures.typeId | typeof fixtures.modeId, ids: number[]) {
	if (ids.length === 0) return [];
	return db()
		.select({ id: fixtures.id, number: fixtures.number, label: fixtures.label, modeId: fixtures.modeId })
		.from(fixtures)
		.where(inArray(column, ids))
		.orderBy(asc(fixtures.number))
		.all();
}

/**
 * Maker + model names one type per project, whatever the letter case: a CSV row naming them
 * must find exactly one (issue 16: a 1-slot duplicate was picked instead of the 4-slot mode).
 */
function refuseDuplicate(projectId: number, maker: string, model: string, exceptId?: number): void {
	const key = (a: string, b: string) => `${a.trim().toLocaleLowerCase()}\u0000${b.trim().toLocaleLowerCase()}`;
	const wanted = key(maker, model);
	const clash = db()
		.select({ id: fixtureTypes.id, maker: fixtureTypes.maker, model: fixtureTypes.model })
		.from(fixtureTypes)
		.where(eq(fixtureTypes.projectId, projectId))
		.all()
		.find((t) => t.id !== exceptId && key(t.maker, t.model) === wanted);
	if (clash)
		throw new DuplicateError(`${clash.maker} ${clash.model} is already a fixture type in this project.`, [
			{ path: ['model'], message: `${clash.maker} ${clash.model} already exists; edit that type instead.` }
		]);
}

export function createType(projectId: number, userId: string, input: TypeCreate): TypeShape {
	return db().transaction(() => {
		if (input.modes.some((m) => m.id !== undefined)) {
			throw new InvalidError('A new type has no mode ids yet; leave id out.', [
				{ path: ['modes'], message: 'Leave mode ids out on create.' }
			]);
		}
		refuseDuplicate(projectId, input.maker, input.model);
		const row = db()
			.insert(fixtureTypes)
			.values({ projectId, maker: input.maker, model: input.model, notes: input.notes, drawFloor: input.drawFloor })
			.returning()
			.get();
		input.modes.forEach((m, i) => insertMode(row.id, m, i));
		const shape = getType(projectId, row.id)!;
		recordAudit({ projectId, userId, action: 'type.create', entity: 'fixture_type', entityId: row.id, after: shape });
		return shape;
	});
}

/**
 * Modes, when given, replace the type's list. A mode keeps its id (and so its fixtures) when the
 * body names that id; a mode left out is deleted, which is refused while fixtures use it. A used
 * mode's channels may change — a longer footprint then shows as an overflow/overlap conflict on
 * the patch rather than being refused, because the type is shared and the patch is the place to fix it.
 */
export function updateType(projectId: number, userId: string, id: number, patch: TypePatch): TypeShape {
	return db().transaction(() => {
		requireRow(projectId, id);
		const before = getType(projectId, id)!;
		const { version, modes: modeList, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(before);
		if (fields.maker !== undefined || fields.model !== undefined)
			refuseDuplicate(projectId, fields.maker ?? before.maker, fields.model ?? before.model, id);
		const changed = db()
			.update(fixtureTypes)
			.set({ ...fields, version: sql`${fixtureTypes.version} + 1`, updatedAt: new Date() })
			.where(and(eq(fixtureTypes.id, id), eq(fixtureTypes.version, version)))
			.run().changes;
		if (changed !== 1) throw new StaleVersionError(getType(projectId, id));
		if (modeList) {
			const existing = new Set(before.modes.map((m) => m.id));
			const foreign = modeList.filter((m) => m.id !== undefined && !existing.has(m.id));
			if (foreign.length > 0) {
				throw new InvalidError(
					`Mode ids ${foreign.map((m) => m.id).join(', ')} are not modes of this type.`,
					foreign.map((m) => ({ path: ['modes', modeList.indexOf(m), 'id'], message: 'Not a mode of this type.' }))
				);
			}
			const kept = new Set(modeList.map((m) => m.id).filter((m): m is number => m !== undefined));
			const dropped = before.modes.filter((m) => !kept.has(m.id));
			const users = fixturesUsing(
				fixtures.modeId,
				dropped.map((m) => m.id)
			);
			if (users.length > 0) {
				const names = dropped.filter((m) => users.some((u) => u.modeId === m.id)).map((m) => `"${m.name}"`);
				throw new InUseError(
					`Mode ${names.join(', ')} is used by fixtures ${users.map((u) => u.number).join(', ')}; change their mode first.`,
					users.map((u) => ({ id: u.id, number: u.number, label: u.label, modeId: u.modeId }))
				);
			}
			if (dropped.length > 0)
				db()
					.delete(modes)
					.where(
						inArray(
							modes.id,
							dropped.map((m) => m.id)
						)
					)
					.run();
			modeList.forEach((m, position) => {
				if (m.id === undefined) return insertMode(id, m, position);
				db()
					.update(modes)
					.set({ name: m.name, position, ...modePower(m) })
					.where(eq(modes.id, m.id))
					.run();
				writeChannels(m.id, m);
			});
		}
		const after = getType(projectId, id)!;
		recordAudit({ projectId, userId, action: 'type.update', entity: 'fixture_type', entityId: id, before, after });
		return after;
	});
}

export function deleteType(projectId: number, userId: string, id: number): void {
	db().transaction(() => {
		requireRow(projectId, id);
		const before = getType(projectId, id)!;
		const users = fixturesUsing(fixtures.typeId, [id]);
		if (users.length > 0) {
			throw new InUseError(
				`${before.maker} ${before.model} is used by ${users.length === 1 ? 'fixture' : 'fixtures'} ${users.map((u) => u.number).join(', ')}; change or delete them first.`,
				users.map((u) => ({ id: u.id, number: u.number, label: u.label }))
			);
		}
		db().delete(fixtureTypes).where(eq(fixtureTypes.id, id)).run();
		recordAudit({ projectId, userId, action: 'type.delete', entity: 'fixture_type', entityId: id, before });
	});
}

/** Moves the listed fixtures to another mode (of this or another type) in one batch; any stale version refuses all. */
export function moveFixtures(projectId: number, userId: string, move: FixtureMove): number[] {
	const target = listTypes(projectId).find((t) => t.modes.some((m) => m.id === move.toModeId));
	if (!target)
		throw new InvalidError('No such mode in this project.', [
			{ path: ['toModeId'], message: 'Pick a mode of this project.' }
		]);
	return updateFixtures(
		projectId,
		userId,
		move.fixtures.map((f) => ({ id: f.id, version: f.version, typeId: target.id, modeId: move.toModeId }))
	).map((f) => f.id);
}

/** A saved mode as the API's mode input, so a type can be written back without one of its modes. */
function modeInputOf(m: TypeShape['modes'][number]): ModeInput {
	return {
		id: m.id,
		name: m.name,
		channels: m.channels.map((c) => ({ ...c, fineOffsets: c.fineOffsets ? [...c.fineOffsets] : undefined })),
		watts: m.watts ?? null,
		inputVolts: m.inputVolts ?? null
	};
}

/**
 * Deletes one mode of a type, first moving the fixtures that use it when `move` is given — all in
 * one transaction, so a refused move leaves the mode and its fixtures as they were.
 */
export function deleteMode(
	projectId: number,
	userId: string,
	typeId: number,
	version: number,
	modeId: number,
	move?: FixtureMove
): TypeShape {
	return db().transaction(() => {
		requireRow(projectId, typeId);
		const before = getType(projectId, typeId)!;
		if (!before.modes.some((m) => m.id === modeId)) throw new NotFoundError('No such mode of this fixture type.');
		if (before.modes.length === 1)
			throw new InvalidError('A type needs at least one mode; delete the type instead.', [
				{ path: ['modes'], message: 'A type needs at least one mode.' }
			]);
		if (move) {
			if (move.toModeId === modeId)
				throw new InvalidError('Pick another mode to move them to.', [
					{ path: ['toModeId'], message: 'Pick another mode.' }
				]);
			moveFixtures(projectId, userId, move);
		}
		return updateType(projectId, userId, typeId, {
			version,
			modes: before.modes.filter((m) => m.id !== modeId).map(modeInputOf)
		});
	});
}

/** Deletes a type, first moving the fixtures that use it to a mode of another type when `move` is given. */
export function deleteTypeMoving(projectId: number, userId: string, id: number, move?: FixtureMove): void {
	db().transaction(() => {
		requireRow(projectId, id);
		if (move) {
			if (getType(projectId, id)!.modes.some((m) => m.id === move.toModeId))
				throw new InvalidError('Pick a mode of another type; this one is being deleted.', [
					{ path: ['toModeId'], message: 'Pick a mode of another type.' }
				]);
			moveFixtures(projectId, userId, move);
		}
		deleteType(projectId, userId, id);
	});
}
