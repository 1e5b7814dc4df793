import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { computePower, type PowerResult } from '../../patch/index';
import { InUseError, InvalidError, NotFoundError, StaleVersionError } from '../errors';
import { recordAudit } from './audit';
import { db } from './index';
import { feedOf } from './patch';
import { circuits, fixtureTypes, fixtures, modes, packTypes, projects } from './schema';
import type {
	CircuitCreate,
	CircuitPatch,
	PackTypeCreate,
	PackTypePatch,
	PowerSettingsPatch
} from '../../schemas/power';

// Pack types, circuits, the project's power settings, and the power figures (issue 15).

type PackTypeRow = typeof packTypes.$inferSelect;
type CircuitRow = typeof circuits.$inferSelect;

export function packTypeShape(r: PackTypeRow) {
	return {
		id: r.id,
		name: r.name,
		chemistry: r.chemistry,
		cells: r.cells,
		ampHours: r.ampHours,
		wattHours: r.wattHours,
		maxCurrentA: r.maxCurrentA,
		onHand: r.onHand,
		chargeHours: r.chargeHours,
		chargers: r.chargers,
		chargerBays: r.chargerBays,
		notes: r.notes,
		version: r.version
	};
}
export type PackTypeShape = ReturnType<typeof packTypeShape>;

export function circuitShape(r: CircuitRow) {
	return {
		id: r.id,
		name: r.name,
		volts: r.volts,
		breakerA: r.breakerA,
		powerFactor: r.powerFactor,
		notes: r.notes,
		version: r.version
	};
}
export type CircuitShape = ReturnType<typeof circuitShape>;

/** The ids a fixture's feed may name in this project. */
export function feedTargets(projectId: number): { packTypes: Set<number>; circuits: Set<number> } {
	const p = db().select({ id: packTypes.id }).from(packTypes).where(eq(packTypes.projectId, projectId)).all();
	const c = db().select({ id: circuits.id }).from(circuits).where(eq(circuits.projectId, projectId)).all();
	return { packTypes: new Set(p.map((r) => r.id)), circuits: new Set(c.map((r) => r.id)) };
}

// ── Pack types ─────────────────────────────────────────────────────────────

export function listPackTypes(projectId: number): PackTypeShape[] {
	return db()
		.select()
		.from(packTypes)
		.where(eq(packTypes.projectId, projectId))
		.orderBy(asc(packTypes.name), asc(packTypes.id))
		.all()
		.map(packTypeShape);
}

function packRow(projectId: number, id: number): PackTypeRow {
	const row = db()
		.select()
		.from(packTypes)
		.where(and(eq(packTypes.id, id), eq(packTypes.projectId, projectId)))
		.get();
	if (!row) throw new NotFoundError('No such pack type in this project.');
	return row;
}

export function getPackType(projectId: number, id: number): PackTypeShape {
	return packTypeShape(packRow(projectId, id));
}

export function createPackType(projectId: number, userId: string, input: PackTypeCreate): PackTypeShape {
	return db().transaction(() => {
		const row = db()
			.insert(packTypes)
			.values({ projectId, ...input, ampHours: input.ampHours ?? null, wattHours: input.wattHours ?? null })
			.returning()
			.get();
		const after = packTypeShape(row);
		recordAudit({ projectId, userId, action: 'pack-type.create', entity: 'pack_type', entityId: row.id, after });
		return after;
	});
}

export function updatePackType(projectId: number, userId: string, id: number, patch: PackTypePatch): PackTypeShape {
	return db().transaction(() => {
		const before = packTypeShape(packRow(projectId, id));
		const { version, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(before);
		// giving one capacity replaces the other: one derives from the other
		if (fields.ampHours != null && fields.wattHours === undefined) fields.wattHours = null;
		if (fields.wattHours != null && fields.ampHours === undefined) fields.ampHours = null;
		const ah = fields.ampHours !== undefined ? fields.ampHours : before.ampHours;
		const wh = fields.wattHours !== undefined ? fields.wattHours : before.wattHours;
		if (ah == null && wh == null)
			throw new InvalidError('Give the capacity in Ah or in Wh.', [
				{ path: ['ampHours'], message: 'Give the capacity in Ah or in Wh.' }
			]);
		const row = db()
			.update(packTypes)
			.set({ ...fields, version: sql`${packTypes.version} + 1`, updatedAt: new Date() })
			.where(and(eq(packTypes.id, id), eq(packTypes.version, version)))
			.returning()
			.get();
		if (!row) throw new StaleVersionError(getPackType(projectId, id));
		const after = packTypeShape(row);
		recordAudit({ projectId, userId, action: 'pack-type.update', entity: 'pack_type', entityId: id, before, after });
		return after;
	});
}

function fedBy(projectId: number, column: typeof fixtures.packTypeId | typeof fixtures.circuitId, id: number) {
	return db()
		.select({ id: fixtures.id, number: fixtures.number, label: fixtures.label, version: fixtures.version })
		.from(fixtures)
		.where(and(eq(fixtures.projectId, projectId), eq(column, id)))
		.orderBy(asc(fixtures.number))
		.all();
}

/** Fixtures fed by what is deleted are refused unless `detach`, which sets their feed to none. */
function unfeed(
	projectId: number,
	userId: string,
	column: typeof fixtures.packTypeId | typeof fixtures.circuitId,
	id: number,
	what: string,
	detach: boolean
): void {
	const users = fedBy(projectId, column, id);
	if (users.length === 0) return;
	if (!detach)
		throw new InUseError(
			`${what} feeds ${users.length === 1 ? 'fixture' : 'fixtures'} ${users.map((f) => f.number).join(', ')}; change their feed first or delete with ?detach=true to set it to none.`,
			users.map((f) => ({ id: f.id, number: f.number, label: f.label }))
		);
	db()
		.update(fixtures)
		.set({ packTypeId: null, circuitId: null, version: sql`${fixtures.version} + 1`, updatedAt: new Date() })
		.where(
			inArray(
				fixtures.id,
				users.map((f) => f.id)
			)
		)
		.run();
	for (const f of users)
		recordAudit({
			projectId,
			userId,
			action: 'fixture.update',
			entity: 'fixture',
			entityId: f.id,
			before: {
				feed: feedOf({
					packTypeId: column === fixtures.packTypeId ? id : null,
					circuitId: column === fixtures.circuitId ? id : null
				})
			},
			after: { feed: { kind: 'none' } }
		});
}

function checkVersion(before: { version: number }, version: number | null) {
	if (version !== null && before.version !== version) throw new StaleVersionError(before);
}

export function deletePackType(
	projectId: number,
	userId: string,
	id: number,
	o: { detach: boolean; version: number | null }
): void {
	db().transaction(() => {
		const before = packTypeShape(packRow(projectId, id));
		checkVersion(before, o.version);
		unfeed(projectId, userId, fixtures.packTypeId, id, `Pack type "${before.name}"`, o.detach);
		db().delete(packTypes).where(eq(packTypes.id, id)).run();
		recordAudit({ projectId, userId, action: 'pack-type.delete', entity: 'pack_type', entityId: id, before });
	});
}

// ── Circuits ───────────────────────────────────────────────────────────────

export function listCircuits(projectId: number): CircuitShape[] {
	return db()
		.select()
		.from(circuits)
		.where(eq(circuits.projectId, projectId))
		.orderBy(asc(circuits.name), asc(circuits.id))
		.all()
		.map(circuitShape);
}

function circuitRow(projectId: number, id: number): CircuitRow {
	const row = db()
		.select()
		.from(circuits)
		.where(and(eq(circuits.id, id), eq(circuits.projectId, projectId)))
		.get();
	if (!row) throw new NotFoundError('No such circuit in this project.');
	return row;
}

export function getCircuit(projectId: number, id: number): CircuitShape {
	return circuitShape(circuitRow(projectId, id));
}

export function createCircuit(projectId: number, userId: string, input: CircuitCreate): CircuitShape {
	return db().transaction(() => {
		const row = db()
			.insert(circuits)
			.values({ projectId, ...input })
			.returning()
			.get();
		const after = circuitShape(row);
		recordAudit({ projectId, userId, action: 'circuit.create', entity: 'circuit', entityId: row.id, after });
		return after;
	});
}

export function updateCircuit(projectId: number, userId: string, id: number, patch: CircuitPatch): CircuitShape {
	return db().transaction(() => {
		const before = circuitShape(circuitRow(projectId, id));
		const { version, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(before);
		const row = db()
			.update(circuits)
			.set({ ...fields, version: sql`${circuits.version} + 1`, updatedAt: new Date() })
			.where(and(eq(circuits.id, id), eq(circuits.version, version)))
			.returning()
			.get();
		if (!row) throw new StaleVersionError(getCircuit(projectId, id));
		const after = circuitShape(row);
		recordAudit({ projectId, userId, action: 'circuit.update', entity: 'circuit', entityId: id, before, after });
		return after;
	});
}

export function deleteCircuit(
	projectId: number,
	userId: string,
	id: number,
	o: { detach: boolean; version: number | null }
): void {
	db().transaction(() => {
		const before = circuitShape(circuitRow(projectId, id));
		checkVersion(before, o.version);
		unfeed(projectId, userId, fixtures.circuitId, id, `Circuit "${before.name}"`, o.detach);
		db().delete(circuits).where(eq(circuits.id, id)).run();
		recordAudit({ projectId, userId, action: 'circuit.delete', entity: 'circuit', entityId: id, before });
	});
}

// ── Settings and figures ───────────────────────────────────────────────────

export interface PowerSettings {
	usableFraction: number;
	dayStart: string;
	dayWrap: string;
	version: number;
}

function settingsOf(projectId: number): PowerSettings {
	const p = db()
		.select({
			usableFraction: projects.usableFraction,
			dayStart: projects.dayStart,
			dayWrap: projects.dayWrap,
			version: projects.version
		})
		.from(projects)
		.where(eq(projects.id, projectId))
		.get();
	if (!p) throw new NotFoundError('No such project.');
	return p;
}

export function updatePowerSettings(projectId: number, userId: string, patch: PowerSettingsPatch): PowerSettings {
	return db().transaction(() => {
		const before = settingsOf(projectId);
		const { version, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(before);
		const changed = db()
			.update(projects)
			.set({ ...fields, version: sql`${projects.version} + 1`, updatedAt: new Date() })
			.where(and(eq(projects.id, projectId), eq(projects.version, version)))
			.run().changes;
		if (changed !== 1) throw new StaleVersionError(settingsOf(projectId));
		const after = settingsOf(projectId);
		recordAudit({ projectId, userId, action: 'project.power', entity: 'project', entityId: projectId, before, after });
		return after;
	});
}

export interface PowerFixtureRow {
	id: number;
	number: number;
	label: string;
	feed: ReturnType<typeof feedOf>;
	drawFullW: number | null;
}

export interface PowerView {
	settings: PowerSettings;
	packTypes: PackTypeShape[];
	circuits: CircuitShape[];
	fixtures: PowerFixtureRow[];
	power: PowerResult;
}

/** Everything the Power page, the power sheet, the fixture page and `GET …/power` show. */
export function loadPower(projectId: number): PowerView {
	const settings = settingsOf(projectId);
	const packs = listPackTypes(projectId);
	const circs = listCircuits(projectId);
	const rows = db()
		.select({
			id: fixtures.id,
			number: fixtures.number,
			label: fixtures.label,
			watts: fixtures.watts,
			intensity: fixtures.lookIntensity,
			packTypeId: fixtures.packTypeId,
			circuitId: fixtures.circuitId,
			modeWatts: modes.watts,
			voltsMin: modes.inputVoltsMin,
			voltsMax: modes.inputVoltsMax,
			floor: fixtureTypes.drawFloor
		})
		.from(fixtures)
		.innerJoin(modes, eq(modes.id, fixtures.modeId))
		.innerJoin(fixtureTypes, eq(fixtureTypes.id, fixtures.typeId))
		.where(eq(fixtures.projectId, projectId))
		.orderBy(asc(fixtures.number))
		.all();
	const list = rows.map((r) => ({
		id: r.id,
		number: r.number,
		label: r.label,
		feed: feedOf(r),
		// the fixture's own watts override its mode's draw
		drawFullW: r.watts ?? r.modeWatts ?? null,
		drawFloor: r.floor,
		intensity: r.intensity,
		inputVolts: r.voltsMin != null && r.voltsMax != null ? { min: r.voltsMin, max: r.voltsMax } : null
	}));
	const power = computePower({
		fixtures: list,
		packTypes: packs,
		circuits: circs,
		usableFraction: settings.usableFraction,
		dayStart: settings.dayStart,
		dayWrap: settings.dayWrap
	});
	return {
		settings,
		packTypes: packs,
		circuits: circs,
		fixtures: list.map((f) => ({ id: f.id, number: f.number, label: f.label, feed: f.feed, drawFullW: f.drawFullW })),
		power
	};
}

/** Sets one feed on many fixtures at once (the bulk "set feed"); one stale version refuses all. */
export function setFeeds(
	projectId: number,
	userId: string,
	list: { id: number; version: number }[],
	feed: ReturnType<typeof feedOf>
): number {
	return db().transaction(() => {
		const t = feedTargets(projectId);
		if (feed.kind === 'battery' && !t.packTypes.has(feed.packTypeId))
			throw new InvalidError('No such pack type in this project.', [
				{ path: ['feed', 'packTypeId'], message: 'No such pack type in this project.' }
			]);
		if (feed.kind === 'mains' && !t.circuits.has(feed.circuitId))
			throw new InvalidError('No such circuit in this project.', [
				{ path: ['feed', 'circuitId'], message: 'No such circuit in this project.' }
			]);
		if (list.length === 0) return 0;
		const rows = db()
			.select()
			.from(fixtures)
			.where(
				and(
					eq(fixtures.projectId, projectId),
					inArray(
						fixtures.id,
						list.map((f) => f.id)
					)
				)
			)
			.all();
		if (rows.length !== list.length) throw new NotFoundError('Some of those fixtures are not in this project.');
		const stale = rows.filter((r) => list.find((f) => f.id === r.id)!.version !== r.version);
		if (stale.length > 0)
			throw new StaleVersionError(
				stale.map((r) => ({ id: r.id, number: r.number, version: r.version, feed: feedOf(r) }))
			);
		const cols = {
			packTypeId: feed.kind === 'battery' ? feed.packTypeId : null,
			circuitId: feed.kind === 'mains' ? feed.circuitId : null
		};
		for (const r of rows) {
			db()
				.update(fixtures)
				.set({ ...cols, version: sql`${fixtures.version} + 1`, updatedAt: new Date() })
				.where(eq(fixtures.id, r.id))
				.run();
			recordAudit({
				projectId,
				userId,
				action: 'fixture.update',
				entity: 'fixture',
				entityId: r.id,
				before: { feed: feedOf(r) },
				after: { feed }
			});
		}
		return rows.length;
	});
}
