import { asc, eq, inArray } from 'drizzle-orm';
import {
	analysePatch,
	computePatch,
	defaultChannelCount,
	breakFootprints,
	modeSlotCount,
	type Conflict,
	type Feed,
	type FixtureControl,
	type Mode
} from '../../patch/index';
import type {
	ChannelShape,
	FixtureShape,
	ModeShape,
	PatchData,
	Project,
	ReceiverShape,
	TypeShape,
	UniverseShape
} from '../../shapes';
import { changeKey } from './change-state';
import { db } from './index';
import { getProject, projectShape } from './projects';
import { fixtureTypes, fixtures, modeChannels, modes, receiverLabels, receivers, universes } from './schema';

// The one place rows become the API's shapes (DESIGN.md "Shapes"). The JSON
// API, the printed sheets, revisions and exports all read the patch here.

export type FixtureRow = typeof fixtures.$inferSelect;
export type UniverseRow = typeof universes.$inferSelect;
export type ReceiverRow = typeof receivers.$inferSelect;
// the shapes live client-safe in src/lib/shapes.ts; re-exported for the server modules that read them here
export type {
	ChannelShape,
	FixtureShape,
	ModeShape,
	PatchData,
	ReceiverShape,
	TypeShape,
	UniverseShape
} from '../../shapes';

export function controlOf(f: Omit<FixtureRow, 'id'>): FixtureControl {
	switch (f.controlKind) {
		case 'dmx':
			return f.breakAddresses != null && f.breakAddresses.length > 0
				? { kind: 'dmx', universeId: f.universeId, address: f.address ?? 0, breaks: f.breakAddresses }
				: { kind: 'dmx', universeId: f.universeId, address: f.address ?? 0 };
		case 'dmx-map':
			return { kind: 'dmx-map', universeId: f.universeId, addresses: f.addressMap ?? {} };
		case 'rc':
			return { kind: 'rc', receiverId: f.receiverId, channels: f.rcChannels ?? {} };
		case 'follow':
			return { kind: 'follow', leaderId: f.leaderId ?? 0 };
		default:
			return { kind: 'manual' };
	}
}

type ControlColumns = {
	controlKind: FixtureControl['kind'];
	universeId: number | null;
	address: number | null;
	breakAddresses: { dmxBreak: number; universeId: number; address: number }[] | null;
	addressMap: Record<string, number> | null;
	receiverId: number | null;
	rcChannels: Record<string, number> | null;
	leaderId: number | null;
};

/** The control columns a control object sets; every other control column is cleared. */
export function controlColumns(control: FixtureControl): ControlColumns {
	// one literal filled in place rather than spreads: an import builds this for every row
	const c: ControlColumns = {
		controlKind: control.kind,
		universeId: null,
		address: null,
		breakAddresses: null,
		addressMap: null,
		receiverId: null,
		rcChannels: null,
		leaderId: null
	};
	switch (control.kind) {
		case 'dmx':
			c.universeId = control.universeId;
			c.address = control.address;
			if (control.breaks !== undefined && control.breaks.length > 0)
				c.breakAddresses = control.breaks.map((b) => ({
					dmxBreak: b.dmxBreak,
					universeId: b.universeId ?? 0,
					address: b.address
				}));
			break;
		case 'dmx-map':
			c.universeId = control.universeId;
			c.addressMap = { ...control.addresses };
			break;
		case 'rc':
			c.receiverId = control.receiverId;
			c.rcChannels = { ...control.channels };
			break;
		case 'follow':
			c.leaderId = control.leaderId;
			break;
		default:
			c.controlKind = 'manual';
	}
	return c;
}

export function fixtureShape(f: FixtureRow): FixtureShape {
	return rowShape(f, f.id);
}

/** fixtureShape of a row yet to be written (or just written), with its id beside it rather than spread in. */
export function rowShape(f: Omit<FixtureRow, 'id'>, id: number): FixtureShape {
	return {
		id,
		number: f.number,
		label: f.label,
		typeId: f.typeId,
		modeId: f.modeId,
		position: f.position,
		group: f.groupName,
		linkGroup: f.linkGroup,
		colour: f.colour,
		watts: f.watts,
		notes: f.notes,
		state: f.state,
		version: f.version,
		look: { hue: f.lookHue, saturation: f.lookSaturation, intensity: f.lookIntensity, cct: f.lookCct },
		control: controlOf(f),
		feed: feedOf(f)
	};
}

export function feedOf(f: Pick<FixtureRow, 'packTypeId' | 'circuitId'>): Feed {
	if (f.packTypeId != null) return { kind: 'battery', packTypeId: f.packTypeId };
	if (f.circuitId != null) return { kind: 'mains', circuitId: f.circuitId };
	return { kind: 'none' };
}

/** The feed columns a feed sets; the other is cleared. */
export function feedColumns(feed: Feed) {
	return {
		packTypeId: feed.kind === 'battery' ? feed.packTypeId : null,
		circuitId: feed.kind === 'mains' ? feed.circuitId : null
	};
}

export function universeShape(u: UniverseRow): UniverseShape {
	return { id: u.id, number: u.number, name: u.name, transport: u.transport, notes: u.notes, version: u.version };
}

export function receiverShape(r: ReceiverRow, labels: Record<string, string> = {}): ReceiverShape {
	return {
		id: r.id,
		name: r.name,
		protocol: r.protocol,
		channelCount: defaultChannelCount(r.protocol),
		transmitterNotes: r.transmitterNotes,
		labels,
		version: r.version
	};
}

/** Types with their modes and channels, in three queries rather than one per mode. */
export function listTypes(projectId: number, typeIds?: number[]): TypeShape[] {
	const typeRows = db()
		.select()
		.from(fixtureTypes)
		.where(eq(fixtureTypes.projectId, projectId))
		.orderBy(asc(fixtureTypes.maker), asc(fixtureTypes.model), asc(fixtureTypes.id))
		.all()
		.filter((t) => !typeIds || typeIds.includes(t.id));
	if (typeRows.length === 0) return [];
	const modeRows = db()
		.select()
		.from(modes)
		.where(
			inArray(
				modes.typeId,
				typeRows.map((t) => t.id)
			)
		)
		.orderBy(asc(modes.position), asc(modes.id))
		.all();
	const channelRows = modeRows.length
		? db()
				.select()
				.from(modeChannels)
				.where(
					inArray(
						modeChannels.modeId,
						modeRows.map((m) => m.id)
					)
				)
				.orderBy(asc(modeChannels.position), asc(modeChannels.id))
				.all()
		: [];
	const channelsByMode = new Map<number, ChannelShape[]>();
	for (const c of channelRows) {
		const list = channelsByMode.get(c.modeId) ?? [];
		list.push({
			offset: c.offset,
			parameter: c.parameter,
			bits: c.bits,
			default: c.defaultValue,
			...(c.min != null ? { min: c.min } : {}),
			...(c.max != null ? { max: c.max } : {}),
			...(c.unit != null ? { unit: c.unit } : {}),
			...(c.dmxFrom != null ? { dmxFrom: c.dmxFrom } : {}),
			...(c.dmxTo != null ? { dmxTo: c.dmxTo } : {}),
			...(c.dmxBreak !== 1 ? { dmxBreak: c.dmxBreak } : {}),
			...(c.fineOffsets != null && c.fineOffsets.length > 0 ? { fineOffsets: c.fineOffsets } : {})
		});
		channelsByMode.set(c.modeId, list);
	}
	const modesByType = new Map<number, ModeShape[]>();
	for (const m of modeRows) {
		const channels = channelsByMode.get(m.id) ?? [];
		const list = modesByType.get(m.typeId) ?? [];
		const mode = { id: m.id, name: m.name, channels };
		const breaks = breakFootprints(mode);
		// a one-break mode keeps its old shape; `breaks` only appears when there is more than one
		list.push({
			...mode,
			slots: modeSlotCount(mode),
			...(breaks.length > 1 ? { breaks } : {}),
			watts: m.watts,
			inputVolts:
				m.inputVoltsMin != null && m.inputVoltsMax != null ? { min: m.inputVoltsMin, max: m.inputVoltsMax } : null
		});
		modesByType.set(m.typeId, list);
	}
	return typeRows.map((t) => ({
		id: t.id,
		maker: t.maker,
		model: t.model,
		notes: t.notes,
		drawFloor: t.drawFloor,
		version: t.version,
		modes: modesByType.get(t.id) ?? []
	}));
}

export function listUniverses(projectId: number): UniverseShape[] {
	return db()
		.select()
		.from(universes)
		.where(eq(universes.projectId, projectId))
		.orderBy(asc(universes.number))
		.all()
		.map(universeShape);
}

export function listReceivers(projectId: number): ReceiverShape[] {
	const rows = db()
		.select()
		.from(receivers)
		.where(eq(receivers.projectId, projectId))
		.orderBy(asc(receivers.name), asc(receivers.id))
		.all();
	if (rows.length === 0) return [];
	const labels = db()
		.select()
		.from(receiverLabels)
		.where(
			inArray(
				receiverLabels.receiverId,
				rows.map((r) => r.id)
			)
		)
		.all();
	const byReceiver = new Map<number, Record<string, string>>();
	for (const l of labels) {
		const map = byReceiver.get(l.receiverId) ?? {};
		map[String(l.channel)] = l.label;
		byReceiver.set(l.receiverId, map);
	}
	return rows.map((r) => receiverShape(r, byReceiver.get(r.id) ?? {}));
}

export function listFixtures(projectId: number): FixtureShape[] {
	return db()
		.select()
		.from(fixtures)
		.where(eq(fixtures.projectId, projectId))
		.orderBy(asc(fixtures.number))
		.all()
		.map(fixtureShape);
}

/** Everything the patch consists of, plus what the engine computes from it. */
export function loadPatch(projectId: number): PatchData {
	const project = getProject(projectId);
	if (!project) throw new Error(`project ${projectId} not found`);
	const types = listTypes(projectId);
	const universeRows = listUniverses(projectId);
	const receiverRows = listReceivers(projectId);
	const fixtureRows = listFixtures(projectId);
	return computeFor(projectShape(project), types, universeRows, receiverRows, fixtureRows);
}

function engineInput(
	project: Project,
	types: TypeShape[],
	universeRows: UniverseShape[],
	receiverRows: ReceiverShape[],
	fixtureRows: FixtureShape[]
) {
	const modeMap = new Map<number, Mode>();
	for (const t of types) for (const m of t.modes) modeMap.set(m.id, m);
	return {
		universes: universeRows,
		modes: modeMap,
		fixtures: fixtureRows,
		receivers: receiverRows,
		artnetOffset: project.artnetOffset === 0 ? (0 as const) : (1 as const)
	};
}

/** computeFor's conflicts alone (an import's summary), without building the per-fixture view. */
export function conflictsFor(
	project: Project,
	types: TypeShape[],
	universeRows: UniverseShape[],
	receiverRows: ReceiverShape[],
	fixtureRows: FixtureShape[]
): Conflict[] {
	return analysePatch(engineInput(project, types, universeRows, receiverRows, fixtureRows)).conflicts;
}

/** Runs the engine over already-loaded shapes (a live patch or a revision snapshot). */
export function computeFor(
	project: Project,
	types: TypeShape[],
	universeRows: UniverseShape[],
	receiverRows: ReceiverShape[],
	fixtureRows: FixtureShape[]
): PatchData {
	const result = computePatch(engineInput(project, types, universeRows, receiverRows, fixtureRows));
	const footprintById = new Map(result.fixtures.map((f) => [f.fixtureId, f]));
	const summaryById = new Map(result.universes.map((u) => [u.universeId, u]));
	return {
		project,
		universes: universeRows.map((u) => ({ ...u, ...summaryById.get(u.id)! })),
		types,
		receivers: receiverRows,
		fixtures: fixtureRows.map((f) => {
			const fp = footprintById.get(f.id);
			const base = { ...f, slots: fp?.ranges ?? [], footprint: fp?.footprint ?? null };
			return fp?.breaks !== undefined ? { ...base, breakSlots: fp.breaks } : base;
		}),
		conflicts: result.conflicts
	};
}

// ── Cached reads ────────────────────────────────────────────────────────────
// The computed patch is reused until anything is written. The key is cheap and never misses a
// write: total_changes() counts every row this connection changed (the server's own writes,
// rolled-back ones included, which only costs a recompute), and data_version moves whenever
// another connection (a script, a test factory, a second process) commits.

interface CacheEntry {
	key: string;
	data: PatchData;
	/** the same patch as the JSON the API sends, made on first ask */
	json?: string;
	/** GET …/conflicts and GET …/fixtures as JSON text, made on first ask */
	conflictsJson?: string;
	fixturesJson?: string;
	/** the same texts as UTF-8, so a response does not encode megabytes again per request */
	bytes?: Map<string, Uint8Array>;
}

const patchCache = new Map<number, CacheEntry>();
const MAX_CACHED_PROJECTS = 16;
/** `state`: a change state the caller has just read (a GET's session check), saving a second read. */
function cacheEntry(projectId: number, state?: string): CacheEntry {
	const key = state ?? changeKey();
	const hit = patchCache.get(projectId);
	if (hit?.key === key) return hit;
	const entry: CacheEntry = { key, data: loadPatch(projectId) };
	// inside a transaction the rows may be uncommitted and may yet roll back: never keep those
	if (db().$client.inTransaction) return entry;
	patchCache.delete(projectId);
	patchCache.set(projectId, entry);
	if (patchCache.size > MAX_CACHED_PROJECTS) patchCache.delete(patchCache.keys().next().value!);
	return entry;
}

/** loadPatch, reused while nothing has been written. Treat the answer as read-only: it is shared. */
export function loadPatchCached(projectId: number): PatchData {
	return cacheEntry(projectId).data;
}

/** JSON text serialised once per change, and a version naming the answer and the write it was made after (an ETag's stuff). */
export interface VersionedJson {
	json: string;
	version: string;
	/** json as UTF-8, encoded once */
	bytes(): Uint8Array;
}

function versioned(entry: CacheEntry, name: string, projectId: number, json: string): VersionedJson {
	return {
		json,
		version: `${name}.${projectId}.${entry.key}`,
		bytes() {
			entry.bytes ??= new Map();
			let b = entry.bytes.get(name);
			if (!b) entry.bytes.set(name, (b = Buffer.from(json, 'utf8')));
			return b;
		}
	};
}

/** The patch as JSON text, serialised once per change: a 20,000-fixture patch is megabytes of it. */
export function patchJsonCached(projectId: number): string {
	return patchJsonVersioned(projectId).json;
}

/** patchJsonCached with the version it was made at. */
export function patchJsonVersioned(projectId: number, state?: string): VersionedJson {
	const entry = cacheEntry(projectId, state);
	entry.json ??= JSON.stringify(entry.data);
	return versioned(entry, 'patch', projectId, entry.json);
}

/** GET …/conflicts as JSON text, serialised once per change. */
export function conflictsJsonCached(projectId: number, state?: string): VersionedJson {
	const entry = cacheEntry(projectId, state);
	entry.conflictsJson ??= JSON.stringify({ conflicts: entry.data.conflicts });
	return versioned(entry, 'conflicts', projectId, entry.conflictsJson);
}

/** GET …/fixtures (listFixtures: the rows, without what the engine computed) as JSON text, serialised once per change. */
export function fixturesJsonCached(projectId: number, state?: string): VersionedJson {
	const entry = cacheEntry(projectId, state);
	entry.fixturesJson ??= JSON.stringify({
		fixtures: entry.data.fixtures.map(({ slots: _slots, footprint: _footprint, breakSlots: _breaks, ...f }) => f)
	});
	return versioned(entry, 'fixtures', projectId, entry.fixturesJson);
}
