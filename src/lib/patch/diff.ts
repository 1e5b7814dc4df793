import type { PatchFixture } from './types';

export type JsonValue = string | number | boolean | null | JsonValue[] | { [key: string]: JsonValue };

/** A fixture as stored in a revision: the DESIGN "Shapes" fixture; fields beyond the engine's are optional. */
export interface SnapshotFixture extends PatchFixture {
	position?: string | null;
	group?: string | null;
	colour?: string | null;
	watts?: number | null;
	notes?: string | null;
	state?: string;
	version?: number;
	[field: string]: JsonValue | PatchFixture['control'] | undefined;
}

/** Anything in a snapshot collection: universes, types, receivers. */
export interface SnapshotRecord {
	id: number;
	number?: number;
	name?: string;
	[field: string]: JsonValue | undefined;
}

export interface PatchSnapshot {
	fixtures: readonly SnapshotFixture[];
	universes?: readonly SnapshotRecord[];
	types?: readonly SnapshotRecord[];
	receivers?: readonly SnapshotRecord[];
}

export interface FieldChange {
	/** Dotted path, e.g. "address" or "control.addresses.hue". */
	field: string;
	/** null when the field is absent on that side. */
	before: JsonValue;
	after: JsonValue;
}

export interface FixtureChange {
	fixtureId: number;
	number: number;
	label: string;
	fields: FieldChange[];
}

export interface RecordChange {
	id: number;
	fields: FieldChange[];
}

export interface CollectionDiff<T> {
	added: T[];
	removed: T[];
	changed: RecordChange[];
}

export interface PatchDiff {
	added: SnapshotFixture[];
	removed: SnapshotFixture[];
	changed: FixtureChange[];
	universes: CollectionDiff<SnapshotRecord>;
	types: CollectionDiff<SnapshotRecord>;
	receivers: CollectionDiff<SnapshotRecord>;
}

// `version` moves on every save, so it would mark every touched fixture as changed; ids are the match key.
const IGNORED = new Set(['id', 'version']);

function flatten(v: unknown, path: string, out: Map<string, JsonValue>): void {
	if (typeof v === 'object' && v !== null) {
		const rec = v as Record<string, unknown>;
		const keys = Object.keys(rec).filter((k) => rec[k] !== undefined && !(path === '' && IGNORED.has(k)));
		// An emptied object or list is still a value someone set; keep it as a leaf.
		if (keys.length === 0 && path !== '') out.set(path, Array.isArray(v) ? [] : {});
		for (const k of keys) flatten(rec[k], path === '' ? k : `${path}.${k}`, out);
	} else if (typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean' || v === null) {
		out.set(path, v);
	}
}

function sameLeaf(a: JsonValue, b: JsonValue): boolean {
	return typeof a === 'object' && a !== null && typeof b === 'object' && b !== null
		? JSON.stringify(a) === JSON.stringify(b)
		: a === b;
}

/** Leaf-level differences, nested objects and arrays flattened into dotted paths; absent reads as null. */
export function diffFields(before: object, after: object): FieldChange[] {
	const b = new Map<string, JsonValue>();
	const a = new Map<string, JsonValue>();
	flatten(before, '', b);
	flatten(after, '', a);
	const out: FieldChange[] = [];
	for (const field of [...new Set([...b.keys(), ...a.keys()])].sort()) {
		const was = b.get(field) ?? null;
		const now = a.get(field) ?? null;
		if (!sameLeaf(was, now)) out.push({ field, before: was, after: now });
	}
	return out;
}

function matchById<T extends { id: number; number?: number }>(
	before: readonly T[],
	after: readonly T[]
): { pairs: [T, T][]; added: T[]; removed: T[] } {
	const afterById = new Map(after.map((a) => [a.id, a]));
	const taken = new Set<T>();
	const pairs: [T, T][] = [];
	const unmatched: T[] = [];
	for (const b of before) {
		const a = afterById.get(b.id);
		if (a !== undefined) {
			pairs.push([b, a]);
			taken.add(a);
		} else unmatched.push(b);
	}
	// A fixture re-created (new id, same number) is the same unit to the crew.
	const freeByNumber = new Map<number, T>();
	for (const a of after)
		if (!taken.has(a) && a.number !== undefined && !freeByNumber.has(a.number)) freeByNumber.set(a.number, a);
	const removed: T[] = [];
	for (const b of unmatched) {
		const a = b.number === undefined ? undefined : freeByNumber.get(b.number);
		if (a === undefined) {
			removed.push(b);
			continue;
		}
		freeByNumber.delete(a.number ?? -1);
		pairs.push([b, a]);
		taken.add(a);
	}
	const order = (x: T, y: T): number => (x.number ?? 0) - (y.number ?? 0) || x.id - y.id;
	return {
		pairs: pairs.sort((x, y) => order(x[1], y[1])),
		added: after.filter((a) => !taken.has(a)).sort(order),
		removed: removed.sort(order)
	};
}

function diffCollection(
	before: readonly SnapshotRecord[] = [],
	after: readonly SnapshotRecord[] = []
): CollectionDiff<SnapshotRecord> {
	const m = matchById(before, after);
	const changed: RecordChange[] = [];
	for (const [b, a] of m.pairs) {
		const fields = diffFields(b, a);
		if (fields.length > 0) changed.push({ id: a.id, fields });
	}
	return { added: m.added, removed: m.removed, changed };
}

/** What changed between two revisions: fixtures matched by id, then by number; field-level before/after. */
export function diffPatches(before: PatchSnapshot, after: PatchSnapshot): PatchDiff {
	const m = matchById(before.fixtures, after.fixtures);
	const changed: FixtureChange[] = [];
	for (const [b, a] of m.pairs) {
		const fields = diffFields(b, a);
		if (fields.length > 0) changed.push({ fixtureId: a.id, number: a.number, label: a.label, fields });
	}
	return {
		added: m.added,
		removed: m.removed,
		changed,
		universes: diffCollection(before.universes, after.universes),
		types: diffCollection(before.types, after.types),
		receivers: diffCollection(before.receivers, after.receivers)
	};
}
