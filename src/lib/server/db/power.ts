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

// ── Pack types and circuits: one CRUD for both ──────────────────────────────
// The two are what a fixture's feed names: listed by name, read, created, version-checked updates,
// deletes refused while a fixture is fed by them (or detached to feed none), every write audited.

type FeedTable = typeof packTypes | typeof circuits;

interface FeedSource<Row, Shape extends { version: number; name: string }, Create, Patch> {
	table: FeedTable;
	shape: (r: Row) => Shape;
	/** audit action prefix and entity name */
	action: 'pack-type' | 'circuit';
	entity: 'pack_type' | 'circuit';
	/** "pack type" → "No such pack type in this project.", `Pack type "Brick"` */
	noun: string;
	feedColumn: typeof fixtures.packTypeId | typeof fixtures.circuitId;
	insertValues?: (input: Create) => Record<string, unknown>;
	/** rules of this kind an update must keep (fields may be adjusted); `before` is the row as read */
	beforeUpdate?: (before: Shape, fields: Omit<Patch, 'version'>) => void;
}

function feedSource<Row, Shape extends { version: number; name: string }, Create, Patch extends { version: number }>(
	src: FeedSource<Row, Shape, Create, Patch>
) {
	// both tables carry id, project_id, name, version and updated_at: queries name those alone, so
	// one table type stands for both in the query builder
	const t = src.table as typeof packTypes;
	const Noun = src.noun[0].toUpperCase() + src.noun.slice(1);
	const row = (projectId: number, id: number): Row => {
		const r = db()
			.select()
			.from(t)
			.where(and(eq(t.id, id), eq(t.projectId, projectId)))
			.get();
		if (!r) throw new NotFoundError(`No such ${src.noun} in this project.`);
		return r as Row;
	};
	const get = (projectId: number, id: number): Shape => src.shape(row(projectId, id));
	return {
		list: (projectId: number): Shape[] =>
			db()
				.select()
				.from(t)
				.where(eq(t.projectId, projectId))
				.orderBy(asc(t.name), asc(t.id))
				.all()
				.map((r) => src.shape(r as Row)),
		get,
		create: (projectId: number, userId: string, input: Create): Shape =>
			db().transaction(() => {
				const values = {
					projectId,
					...input,
					...src.insertValues?.(input)
				} as unknown as typeof packTypes.$inferInsert;
				const created = db().insert(t).values(values).returning().get();
				const after = src.shape(created as Row);
				recordAudit({
					projectId,
					userId,
					action: `${src.action}.create`,
					entity: src.entity,
					entityId: created.id,
					after
				});
				return after;
			}),
		update: (projectId: number, userId: string, id: number, patch: Patch): Shape =>
			db().transaction(() => {
				const before = get(projectId, id);
				const { version, ...fields } = patch;
				if (before.version !== version) throw new StaleVersionError(before);
				src.beforeUpdate?.(before, fields);
				const updated = db()
					.update(t)
					.set({ ...fields, version: sql`${t.version} + 1`, updatedAt: new Date() })
					.where(and(eq(t.id, id), eq(t.version, version)))
					.returning()
					.get();
				if (!updated) throw new StaleVersionError(get(projectId, id));
				const after = src.shape(updated as Row);
				recordAudit({
					projectId,
					userId,
					action: `${src.action}.update`,
					entity: src.entity,
					entityId: id,
					before,
					after
				});
				return after;
			}),
		remove: (projectId: number, userId: string, id: number, o: { detach: boolean; version: number | null }): void =>
			db().transaction(() => {
				const before = get(projectId, id);
				if (o.version !== null && before.version !== o.version) throw new StaleVersionError(before);
				unfeed(projectId, userId, src.feedColumn, id, `${Noun} "${before.name}"`, o.detach);
				db().delete(t).where(eq(t.id, id)).run();
				recordAudit({ projectId, userId, action: `${src.action}.delete`, entity: src.entity, entityId: id, before });
			})
	};
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

const packs = feedSource<PackTypeRow, PackTypeShape, PackTypeCreate, PackTypePatch>({
	table: packTypes,
	shape: packTypeShape,
	action: 'pack-type',
	entity: 'pack_type',
	noun: 'pack type',
	feedColumn: fixtures.packTypeId,
	insertValues: (input) => ({ ampHours: input.ampHours ?? null, wattHours: input.wattHours ?? null }),
	beforeUpdate(before, fields) {
		// giving one capacity replaces the other: one derives from the other
		if (fields.ampHours != null && fields.wattHours === undefined) fields.wattHours = null;
		if (fields.wattHours != null && fields.ampHours === undefined) fields.ampHours = null;
		const ah = fields.ampHours !== undefined ? fields.ampHours : before.ampHours;
		const wh = fields.wattHours !== undefined ? fields.wattHours : before.wattHours;
		if (ah == null && wh == null)
			throw new InvalidError('Give the capacity in Ah or in Wh.', [
				{ path: ['ampHours'], message: 'Give the capacity in Ah or in Wh.' }
			]);
	}
});

const circuitSource = feedSource<CircuitRow, CircuitShape, CircuitCreate, CircuitPatch>({
	table: circuits,
	shape: circuitShape,
	action: 'circuit',
	entity: 'circuit',
	noun: 'circuit',
	feedColumn: fixtures.circuitId
});

export const listPackTypes = packs.list;
export const getPackType = packs.get;
export const createPackType = packs.create;
export const updatePackType = packs.update;
export const deletePackType = packs.remove;

export const listCircuits = circuitSource.list;
export const getCircuit = circuitSource.get;
export const createCircuit = circuitSource.create;
export const updateCircuit = circuitSource.update;
export const deleteCircuit = circuitSource.remove;

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
