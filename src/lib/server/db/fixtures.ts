import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import {
	autoAddressBreaks,
	breakFootprints,
	defaultChannelCount,
	modeBreaks,
	modeSlotCount,
	resolveDmx,
	resolveDmxMap,
	type AutoAddressBreaksResult,
	type FootprintProblem,
	type SlotRange
} from '../../patch/index';
import type { FieldIssue } from '../errors';
import { DuplicateError, InUseError, InvalidError, NotFoundError, StaleVersionError } from '../errors';
import { recordAudit, recordAuditMany } from './audit';
import { insertMany } from './bulk';
import { db } from './index';
import {
	controlColumns,
	feedColumns,
	controlOf,
	fixtureShape,
	rowShape,
	listTypes,
	loadPatchCached,
	type FixtureRow,
	type FixtureShape,
	type ModeShape
} from './patch';
import { fixtures, receivers, universes, uploads } from './schema';
import { detachFixture } from './universes';
import { feedTargets } from './power';
import type { AutopatchInput, FixtureCreate, FixturePatch } from '../../schemas/fixture';

type Path = (string | number)[];

/** What a fixture write is checked against: this project's types, universes, receivers and fixtures. */
interface Context {
	modes: Map<number, { typeId: number; mode: ModeShape }>;
	typeIds: Set<number>;
	universes: Map<number, number>;
	receivers: Map<number, { name: string; count: number }>;
	fixtures: Map<number, { number: number; kind: FixtureRow['controlKind']; leaderId: number | null }>;
	packTypes: Set<number>;
	circuits: Set<number>;
}

function loadContext(projectId: number): Context {
	const modes = new Map<number, { typeId: number; mode: ModeShape }>();
	const typeIds = new Set<number>();
	for (const t of listTypes(projectId)) {
		typeIds.add(t.id);
		for (const m of t.modes) modes.set(m.id, { typeId: t.id, mode: m });
	}
	const u = db()
		.select({ id: universes.id, number: universes.number })
		.from(universes)
		.where(eq(universes.projectId, projectId))
		.all();
	const r = db().select().from(receivers).where(eq(receivers.projectId, projectId)).all();
	const f = db()
		.select({ id: fixtures.id, number: fixtures.number, kind: fixtures.controlKind, leaderId: fixtures.leaderId })
		.from(fixtures)
		.where(eq(fixtures.projectId, projectId))
		.all();
	return {
		modes,
		typeIds,
		universes: new Map(u.map((x) => [x.id, x.number])),
		receivers: new Map(r.map((x) => [x.id, { name: x.name, count: defaultChannelCount(x.protocol) }])),
		fixtures: new Map(f.map((x) => [x.id, { number: x.number, kind: x.kind, leaderId: x.leaderId }])),
		...feedTargets(projectId)
	};
}

function problemMessage(p: FootprintProblem, slots: number): string {
	switch (p.kind) {
		case 'overflow':
			return p.parameter === undefined
				? `This mode needs ${slots} slots; from address ${p.address} it would run to slot ${p.lastSlot}, past 512. Start at ${513 - slots} or lower.`
				: `${p.parameter} at ${p.address} needs ${p.needs} slots and would run to slot ${p.lastSlot}, past 512.`;
		case 'self-overlap':
			return `${p.parameters.join(' and ')} both claim slot ${p.slots.join(', ')} — give each parameter its own address.`;
		default:
			return `Address ${p.address} is outside 1–512.`;
	}
}

/** A mode's slot count and further breaks, worked out once per mode rather than once per fixture of a batch. */
const footprints = new WeakMap<ModeShape, { slots: number; wanted: ReturnType<typeof breakFootprints> }>();
function footprintOf(mode: ModeShape) {
	let fp = footprints.get(mode);
	if (fp === undefined) {
		fp = { slots: modeSlotCount(mode), wanted: breakFootprints(mode).filter((b) => b.dmxBreak !== 1) };
		footprints.set(mode, fp);
	}
	return fp;
}

/** Every check that needs the database; answers issues rather than throwing so a batch reports all at once. */
function check(ctx: Context, f: FixtureCreate, path: Path, selfId?: number): FieldIssue[] {
	const issues: FieldIssue[] = [];
	const at = (p: Path, message: string) => issues.push({ path: [...path, ...p], message });
	if (!ctx.typeIds.has(f.typeId)) at(['typeId'], 'No such fixture type in this project.');
	const mode = ctx.modes.get(f.modeId);
	if (!mode) at(['modeId'], 'No such mode in this project.');
	else if (mode.typeId !== f.typeId) at(['modeId'], 'This mode belongs to another fixture type.');
	if (f.feed.kind === 'battery' && !ctx.packTypes.has(f.feed.packTypeId))
		at(['feed', 'packTypeId'], 'No such pack type in this project.');
	if (f.feed.kind === 'mains' && !ctx.circuits.has(f.feed.circuitId))
		at(['feed', 'circuitId'], 'No such circuit in this project.');
	const c = f.control;
	switch (c.kind) {
		case 'dmx': {
			if (!ctx.universes.has(c.universeId)) at(['control', 'universeId'], 'No such universe in this project.');
			if (mode) {
				const { slots, wanted } = footprintOf(mode.mode);
				for (const p of resolveDmx(c.address, slots).problems) at(['control', 'address'], problemMessage(p, slots));
				(c.breaks ?? []).forEach((b, i) => {
					const fp = wanted.find((w) => w.dmxBreak === b.dmxBreak);
					if (fp === undefined) {
						at(['control', 'breaks', i, 'dmxBreak'], `Mode "${mode.mode.name}" has no DMX break ${b.dmxBreak}.`);
						return;
					}
					if (!ctx.universes.has(b.universeId))
						at(['control', 'breaks', i, 'universeId'], 'No such universe in this project.');
					for (const p of resolveDmx(b.address, fp.slots).problems)
						at(['control', 'breaks', i, 'address'], problemMessage(p, fp.slots));
				});
			}
			break;
		}
		case 'dmx-map': {
			if (!ctx.universes.has(c.universeId)) at(['control', 'universeId'], 'No such universe in this project.');
			if (!mode) break;
			// DIN SPEC 15800 DMX mode: each break is its own DMX line; one map in one universe cannot say where the others land
			const spans = modeBreaks(mode.mode);
			if (spans.length > 1) {
				at(
					['control', 'kind'],
					`Mode "${mode.mode.name}" spans DMX breaks ${spans.slice(0, -1).join(', ')} and ${spans[spans.length - 1]}; an address per parameter covers one universe only, so give this fixture a start address per break instead.`
				);
				break;
			}
			const slotted = new Set(mode.mode.channels.filter((ch) => ch.offset !== null).map((ch) => ch.parameter));
			for (const key of Object.keys(c.addresses)) {
				if (!slotted.has(key))
					at(
						['control', 'addresses', key],
						`"${key}" is not a parameter of mode "${mode.mode.name}" that takes a slot.`
					);
			}
			for (const p of resolveDmxMap(c.addresses, mode.mode).problems) {
				// a parameter left out is an open item the conflicts list shows, not bad input
				if (p.kind === 'out-of-range' && p.address === null) continue;
				at(['control', 'addresses', ...('parameter' in p && p.parameter ? [p.parameter] : [])], problemMessage(p, 0));
			}
			break;
		}
		case 'rc': {
			const params = new Set(mode?.mode.channels.map((ch) => ch.parameter) ?? []);
			const r = ctx.receivers.get(c.receiverId);
			if (!r) at(['control', 'receiverId'], 'No such receiver in this project.');
			for (const [key, ch] of Object.entries(c.channels)) {
				if (mode && !params.has(key))
					at(['control', 'channels', key], `"${key}" is not a parameter of mode "${mode.mode.name}".`);
				if (r && ch > r.count) at(['control', 'channels', key], `Receiver "${r.name}" has channels 1–${r.count}.`);
			}
			break;
		}
		case 'follow': {
			const leader = ctx.fixtures.get(c.leaderId);
			if (!leader) at(['control', 'leaderId'], 'No such fixture in this project.');
			else if (c.leaderId === selfId) at(['control', 'leaderId'], 'A fixture cannot follow itself.');
			else if (leader.kind === 'follow')
				at(['control', 'leaderId'], `Fixture ${leader.number} follows another fixture itself; follow its leader.`);
			if (
				selfId !== undefined &&
				[...ctx.fixtures.values()].some((o) => o.kind === 'follow' && o.leaderId === selfId)
			) {
				at(['control', 'kind'], 'Other fixtures follow this one; a leader cannot follow.');
			}
			break;
		}
	}
	return issues;
}

/** The columns a create body sets, as one literal (an import builds this for every row). */
function columnsOf(f: FixtureCreate) {
	const c = controlColumns(f.control);
	const feed = feedColumns(f.feed);
	return {
		number: f.number,
		label: f.label,
		typeId: f.typeId,
		modeId: f.modeId,
		position: f.position,
		groupName: f.group,
		linkGroup: f.linkGroup,
		colour: f.colour,
		watts: f.watts,
		notes: f.notes,
		state: f.state,
		lookHue: f.look.hue ?? null,
		lookSaturation: f.look.saturation ?? null,
		lookIntensity: f.look.intensity ?? null,
		lookCct: f.look.cct ?? null,
		controlKind: c.controlKind,
		universeId: c.universeId,
		address: c.address,
		breakAddresses: c.breakAddresses,
		addressMap: c.addressMap,
		receiverId: c.receiverId,
		rcChannels: c.rcChannels,
		leaderId: c.leaderId,
		packTypeId: feed.packTypeId,
		circuitId: feed.circuitId
	};
}

/** The row as a full create body, so a PATCH is checked exactly like a create. */
function asInput(s: FixtureShape): FixtureCreate {
	return {
		number: s.number,
		label: s.label,
		typeId: s.typeId,
		modeId: s.modeId,
		position: s.position,
		group: s.group,
		linkGroup: s.linkGroup,
		colour: s.colour,
		watts: s.watts,
		notes: s.notes,
		state: s.state,
		look: s.look,
		control: s.control as FixtureCreate['control'],
		feed: s.feed ?? { kind: 'none' }
	};
}

function refuse(issues: FieldIssue[]): never {
	throw new InvalidError(
		issues.length === 1 ? issues[0].message : `${issues.length} problems; nothing was written.`,
		issues
	);
}

function numbersClash(ctx: Context, wanted: { number: number; id?: number; path: Path }[]): void {
	const owner = new Map<number, number | undefined>();
	for (const [id, f] of ctx.fixtures) owner.set(f.number, id);
	// fixtures in this write release their old numbers
	for (const w of wanted) if (w.id !== undefined) owner.delete(ctx.fixtures.get(w.id)!.number);
	const issues: FieldIssue[] = [];
	for (const w of wanted) {
		if (owner.has(w.number) && owner.get(w.number) !== w.id) {
			issues.push({
				path: [...w.path, 'number'],
				message: `Fixture number ${w.number} is already taken in this project.`
			});
		}
		owner.set(w.number, w.id);
	}
	if (issues.length > 0)
		throw new DuplicateError(issues[0].message + (issues.length > 1 ? ` (and ${issues.length - 1} more)` : ''), issues);
}

export function getFixture(projectId: number, id: number): FixtureShape | undefined {
	const row = db()
		.select()
		.from(fixtures)
		.where(and(eq(fixtures.id, id), eq(fixtures.projectId, projectId)))
		.get();
	return row ? fixtureShape(row) : undefined;
}

export function requireFixture(projectId: number, id: number): FixtureShape {
	const f = getFixture(projectId, id);
	if (!f) throw new NotFoundError('No such fixture in this project.');
	return f;
}

/** One fixture or many, all-or-nothing. */
/** Another process may take a number between our check and our write; the index has the last word. */
function uniqueAsConflict<T>(write: () => T): T {
	try {
		return write();
	} catch (err) {
		if ((err as { code?: string }).code === 'SQLITE_CONSTRAINT_UNIQUE') {
			throw new DuplicateError('A fixture number in this write is already taken; nothing was written.');
		}
		throw err;
	}
}

export function createFixtures(
	projectId: number,
	userId: string,
	inputs: FixtureCreate[],
	audit: 'each' | 'none' = 'each'
): FixtureShape[] {
	return uniqueAsConflict(() => createFixturesTx(projectId, userId, inputs, audit));
}

/**
 * Every check a create runs (the project's types, modes, universes, feeds, numbers), without writing:
 * answers the rows the insert would write (without ids). A CSV import's preview runs exactly this.
 */
export function checkFixtureCreates(projectId: number, inputs: FixtureCreate[]): Omit<FixtureRow, 'id'>[] {
	const ctx = loadContext(projectId);
	const many = inputs.length > 1;
	const issues = inputs.flatMap((f, i) => check(ctx, f, many ? [i] : []));
	if (issues.length > 0) refuse(issues);
	numbersClash(
		ctx,
		inputs.map((f, i) => ({ number: f.number, path: many ? [i] : [] }))
	);
	const now = new Date();
	// one literal per row, not spreads of one: an import builds 20,000 of them
	return inputs.map((f) => {
		const row = columnsOf(f) as Omit<FixtureRow, 'id'>;
		row.projectId = projectId;
		row.version = 1;
		row.createdAt = now;
		row.updatedAt = now;
		return row;
	});
}

/**
 * Inserts rows checkFixtureCreates answered, in the caller's transaction, checked against the database
 * as it still is (a CSV import's kept preview plan; import/csv.ts applyCsvPlan); answers their ids.
 */
export function insertCheckedFixtures(rows: Omit<FixtureRow, 'id'>[]): number[] {
	return uniqueAsConflict(() => insertMany(fixtures, rows));
}

/**
 * `audit: 'each'` records one entry per fixture; `'none'` leaves the audit to the caller, for an
 * import that records one entry for the whole file.
 */
function createFixturesTx(
	projectId: number,
	userId: string,
	inputs: FixtureCreate[],
	audit: 'each' | 'none'
): FixtureShape[] {
	return db().transaction(() => {
		const rows = checkFixtureCreates(projectId, inputs);
		// one prepared statement for the batch: a 20,000-row import is 20,000 runs of it, not 20,000 queries built
		const ids = insertMany(fixtures, rows);
		const shapes = rows.map((row, i) => rowShape(row, ids[i]));
		if (audit === 'each')
			recordAuditMany(
				shapes.map((shape) => ({
					projectId,
					userId,
					action: 'fixture.create',
					entity: 'fixture',
					entityId: shape.id,
					after: shape
				}))
			);
		return shapes;
	});
}

export type FixtureChange = Omit<FixturePatch, 'version'> & { id: number; version: number };

function applyChanges(projectId: number, userId: string, changes: FixtureChange[], many: boolean): FixtureShape[] {
	// read the project's types, universes and numbers only for a change that is checked against them:
	// a state or notes change (most writes on set) skips it
	let loaded: Context | undefined;
	const ctx = () => (loaded ??= loadContext(projectId));
	const rows = db()
		.select()
		.from(fixtures)
		.where(
			and(
				eq(fixtures.projectId, projectId),
				inArray(
					fixtures.id,
					changes.map((c) => c.id)
				)
			)
		)
		.all();
	const byId = new Map(rows.map((r) => [r.id, fixtureShape(r)]));
	const missing = changes.filter((c) => !byId.has(c.id));
	if (missing.length > 0)
		throw new NotFoundError(`No such fixture in this project: id ${missing.map((m) => m.id).join(', ')}.`);
	const stale = changes.filter((c) => byId.get(c.id)!.version !== c.version);
	if (stale.length > 0) {
		if (!many) throw new StaleVersionError(byId.get(stale[0].id));
		throw new StaleVersionError(
			changes.map((c) => byId.get(c.id)),
			`${stale.length === 1 ? 'A fixture' : `${stale.length} fixtures`} changed since you read them (ids ${stale.map((s) => s.id).join(', ')}); nothing was written.`,
			{ stale: stale.map((s) => s.id) }
		);
	}
	const merged = changes.map((c) => {
		const before = byId.get(c.id)!;
		const { id, version, look, ...fields } = c;
		void id;
		void version;
		return {
			before,
			change: c,
			next: { ...asInput(before), ...fields, look: { ...before.look, ...look } } as FixtureCreate
		};
	});
	// a type change without a mode keeps a mode of the wrong type, which the check reports;
	// only what the change touches is checked, so legacy rows can still take a state or notes change
	const issues = merged.flatMap((m, i) =>
		m.change.control !== undefined ||
		m.change.modeId !== undefined ||
		m.change.typeId !== undefined ||
		m.change.feed !== undefined
			? check(ctx(), m.next, many ? ['fixtures', i] : [], m.before.id)
			: []
	);
	if (issues.length > 0) refuse(issues);
	const numbered = merged.filter((m) => m.change.number !== undefined);
	if (numbered.length > 0)
		numbersClash(
			ctx(),
			numbered.map((m) => ({
				number: m.next.number,
				id: m.before.id,
				path: many ? ['fixtures', changes.indexOf(m.change)] : []
			}))
		);
	// numbers move aside first so a batch may swap them without tripping the unique index mid-way
	const renumbered = merged.filter((m) => m.change.number !== undefined).map((m) => m.before.id);
	if (renumbered.length > 0)
		db()
			.update(fixtures)
			.set({ number: sql`-${fixtures.id}` })
			.where(inArray(fixtures.id, renumbered))
			.run();
	return merged.map(({ before, change, next }) => {
		// check-and-write in one statement: of two writers holding the same version, exactly one changes the row
		const row = db()
			.update(fixtures)
			.set({ ...columnsOf(next), version: sql`${fixtures.version} + 1`, updatedAt: new Date() })
			.where(and(eq(fixtures.id, before.id), eq(fixtures.version, change.version)))
			.returning()
			.get();
		if (!row) throw new StaleVersionError(getFixture(projectId, before.id));
		const after = fixtureShape(row);
		recordAudit({ projectId, userId, action: 'fixture.update', entity: 'fixture', entityId: before.id, before, after });
		return after;
	});
}

export function updateFixture(projectId: number, userId: string, id: number, patch: FixturePatch): FixtureShape {
	return uniqueAsConflict(() => db().transaction(() => applyChanges(projectId, userId, [{ ...patch, id }], false)[0]));
}

/** Many fixtures in one transaction: one stale version refuses the whole batch. */
export function updateFixtures(projectId: number, userId: string, changes: FixtureChange[]): FixtureShape[] {
	return uniqueAsConflict(() => db().transaction(() => applyChanges(projectId, userId, changes, true)));
}

/** Refuses while other fixtures follow this one, unless `detach` (they become manual). Returns the photo files to remove. */
export function deleteFixture(projectId: number, userId: string, id: number, detach: boolean): string[] {
	return db().transaction(() => {
		const before = requireFixture(projectId, id);
		const followers = db()
			.select()
			.from(fixtures)
			.where(and(eq(fixtures.projectId, projectId), eq(fixtures.leaderId, id)))
			.orderBy(asc(fixtures.number))
			.all();
		if (followers.length > 0 && !detach) {
			throw new InUseError(
				`${followers.length === 1 ? 'Fixture' : 'Fixtures'} ${followers.map((f) => f.number).join(', ')} follow fixture ${before.number}; delete with ?detach=true to set them to manual.`,
				followers.map((f) => ({ id: f.id, number: f.number, label: f.label }))
			);
		}
		for (const f of followers) detachFixture(projectId, userId, f, `leader ${before.number} deleted`);
		const files = db().select({ storedName: uploads.storedName }).from(uploads).where(eq(uploads.fixtureId, id)).all();
		db().delete(fixtures).where(eq(fixtures.id, id)).run();
		recordAudit({ projectId, userId, action: 'fixture.delete', entity: 'fixture', entityId: id, before });
		return files.map((f) => f.storedName);
	});
}

/**
 * Several fixtures in one transaction (the table's Delete): followers that are being deleted too
 * do not hold their leader; any other follower refuses the whole batch unless `detach`.
 * Returns the deleted ids and the photo files to remove.
 */
export function deleteFixtures(
	projectId: number,
	userId: string,
	ids: number[],
	detach: boolean
): { deleted: number[]; detached: number[]; files: string[] } {
	return db().transaction(() => {
		const rows = db()
			.select()
			.from(fixtures)
			.where(and(eq(fixtures.projectId, projectId), inArray(fixtures.id, ids)))
			.all();
		const found = new Set(rows.map((r) => r.id));
		const missing = ids.filter((id) => !found.has(id));
		if (missing.length > 0) throw new NotFoundError(`No such fixture in this project: id ${missing.join(', ')}.`);
		const followers = db()
			.select()
			.from(fixtures)
			.where(and(eq(fixtures.projectId, projectId), inArray(fixtures.leaderId, ids)))
			.orderBy(asc(fixtures.number))
			.all()
			.filter((f) => !found.has(f.id));
		if (followers.length > 0 && !detach) {
			const numberOf = new Map(rows.map((r) => [r.id, r.number]));
			const leaders = [...new Set(followers.map((f) => numberOf.get(f.leaderId!)))].join(', ');
			throw new InUseError(
				`${followers.length === 1 ? 'Fixture' : 'Fixtures'} ${followers.map((f) => f.number).join(', ')} ${followers.length === 1 ? 'follows' : 'follow'} ${leaders}; nothing was deleted. Choose to set ${followers.length === 1 ? 'it' : 'them'} to manual, or delete ${followers.length === 1 ? 'it' : 'them'} too.`,
				followers.map((f) => ({ id: f.id, number: f.number, label: f.label, leaderId: f.leaderId }))
			);
		}
		const numberOf = new Map(rows.map((r) => [r.id, r.number]));
		for (const f of followers) detachFixture(projectId, userId, f, `leader ${numberOf.get(f.leaderId!)} deleted`);
		const files = db()
			.select({ storedName: uploads.storedName })
			.from(uploads)
			.where(inArray(uploads.fixtureId, ids))
			.all();
		for (const row of rows) {
			const before = fixtureShape(row);
			recordAudit({ projectId, userId, action: 'fixture.delete', entity: 'fixture', entityId: row.id, before });
		}
		// leader_id is ON DELETE RESTRICT, checked row by row: unhook the chosen ones from each other first
		db().update(fixtures).set({ leaderId: null }).where(inArray(fixtures.id, ids)).run();
		db().delete(fixtures).where(inArray(fixtures.id, ids)).run();
		return { deleted: ids, detached: followers.map((f) => f.id), files: files.map((f) => f.storedName) };
	});
}

/**
 * The engine's first-fit placement into one universe around what is already patched there
 * (the fixtures being placed do not count as occupying their old slots).
 */
export function autopatch(
	projectId: number,
	userId: string,
	input: AutopatchInput
): AutoAddressBreaksResult & { applied: boolean } {
	return db().transaction(() => {
		const patch = loadPatchCached(projectId);
		const universe = patch.universes.find((u) => u.id === input.universeId);
		if (!universe)
			throw new InvalidError('No such universe in this project.', [
				{ path: ['universeId'], message: 'No such universe in this project.' }
			]);
		const moving = new Set(input.fixtureIds);
		const chosen = patch.fixtures.filter((f) => moving.has(f.id));
		if (chosen.length !== moving.size) {
			const known = new Set(chosen.map((f) => f.id));
			const stray = input.fixtureIds.filter((f) => !known.has(f));
			throw new InvalidError(`No such fixtures in this project: ${stray.join(', ')}.`, [
				{ path: ['fixtureIds'], message: `Unknown ids ${stray.join(', ')}.` }
			]);
		}
		const modeOf = new Map<number, ModeShape>();
		for (const t of patch.types) for (const m of t.modes) modeOf.set(m.id, m);
		const universeIds = new Set(patch.universes.map((u) => u.id));
		const stray = input.breakUniverses.filter((b) => !universeIds.has(b.universeId));
		if (stray.length > 0)
			throw new InvalidError('No such universe in this project.', [
				...stray.map((b) => ({
					path: ['breakUniverses', input.breakUniverses.indexOf(b), 'universeId'],
					message: `No such universe in this project for break ${b.dmxBreak}.`
				}))
			]);
		// every slot claimed by a fixture that stays, per universe, break 1 and further breaks alike
		const occupied = new Map<number, SlotRange[]>();
		const claim = (u: number | null, runs: readonly SlotRange[]) => {
			if (u === null || runs.length === 0) return;
			const list = occupied.get(u) ?? [];
			list.push(...runs);
			occupied.set(u, list);
		};
		for (const f of patch.fixtures) {
			if (moving.has(f.id)) continue;
			if (f.control.kind === 'dmx' || f.control.kind === 'dmx-map') claim(f.control.universeId, f.slots);
			for (const b of f.breakSlots ?? []) claim(b.universeId, b.ranges);
		}
		const labels = new Map(patch.universes.map((u) => [u.id, `universe ${u.number}`]));
		const result = autoAddressBreaks({
			fixtures: chosen.map((f) => {
				const mode = modeOf.get(f.modeId);
				const breaks = mode?.breaks?.filter((b) => b.dmxBreak !== 1);
				return breaks && breaks.length > 0
					? { id: f.id, number: f.number, slots: mode?.slots ?? 0, breaks }
					: { id: f.id, number: f.number, slots: mode?.slots ?? 0 };
			}),
			universeId: input.universeId,
			breakUniverses: Object.fromEntries(input.breakUniverses.map((b) => [b.dmxBreak, b.universeId])),
			occupied,
			labels,
			start: input.start,
			align: input.align,
			gap: input.gap
		});
		if (input.apply) {
			const byId = new Map(chosen.map((f) => [f.id, f]));
			for (const p of result.placed) {
				const before = byId.get(p.fixtureId)!;
				const row = db()
					.update(fixtures)
					.set({
						...controlColumns({ kind: 'dmx', universeId: input.universeId, address: p.address, breaks: p.breaks }),
						version: sql`${fixtures.version} + 1`,
						updatedAt: new Date()
					})
					.where(eq(fixtures.id, p.fixtureId))
					.returning()
					.get()!;
				recordAudit({
					projectId,
					userId,
					action: 'fixture.autopatch',
					entity: 'fixture',
					entityId: p.fixtureId,
					before: { control: before.control, version: before.version },
					after: { control: controlOf(row), version: row.version }
				});
			}
		}
		return { ...result, applied: input.apply };
	});
}
