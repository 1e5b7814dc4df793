import type { FixtureControl } from '$lib/patch';
import type { PatchData } from '$lib/shapes';

// The patch table's first load in a lean shape (issue 18: ≤ 2 MB at 20,000 fixtures; the full
// GET …/patch is about 7.7 MB). Fixtures travel as columns rather than objects, every string once
// in a table, every integer column as differences from the row before (ids, numbers, addresses
// and string indexes mostly climb by small steps), and the slots a plain DMX fixture claims are
// left out because they follow from its address and footprint. Notes are left out: the table
// does not show them (the fixture page does). Universes, types, receivers and conflicts are small
// and travel as they are. Pure and client-safe: the server encodes, the page decodes.

type Fixture = PatchData['fixtures'][number];

export interface TableFeed {
	v: 1;
	project: PatchData['project'];
	universes: PatchData['universes'];
	types: PatchData['types'];
	receivers: PatchData['receivers'];
	conflicts: PatchData['conflicts'];
	/** every string of the fixture columns, once */
	strings: string[];
	/** fixtures */
	n: number;
	/**
	 * column name → integers, each the difference from the row before (nullable columns hold
	 * value + 1, 0 for null); a column that is the same on every row is its one value
	 */
	columns: Record<Column, number[]>;
}

const COLUMNS = [
	'id',
	'number',
	'label',
	'typeId',
	'modeId',
	'position',
	'group',
	'linkGroup',
	'colour',
	'watts',
	'state',
	'version',
	'look',
	'feed',
	'kind',
	/** universeId, receiverId or leaderId by kind */
	'ref',
	'address',
	/** JSON of the control's other members (breaks, addresses, channels) */
	'extra',
	/** JSON of the slots when they do not follow from address + footprint */
	'slots',
	'footprint',
	'breakSlots'
] as const;
type Column = (typeof COLUMNS)[number];

const REF_KEY = { dmx: 'universeId', 'dmx-map': 'universeId', rc: 'receiverId', follow: 'leaderId' } as const;

function derivedSlots(f: Fixture): boolean {
	const c = f.control;
	return (
		c.kind === 'dmx' &&
		f.footprint !== null &&
		f.slots.length === 1 &&
		f.slots[0].start === c.address &&
		f.slots[0].end === c.address + f.footprint - 1
	);
}

export function encodeTableFeed(p: PatchData): TableFeed {
	const strings: string[] = [];
	const index = new Map<string, number>();
	const s = (v: string): number => {
		let i = index.get(v);
		if (i === undefined) index.set(v, (i = strings.push(v) - 1));
		return i;
	};
	const opt = (v: string | null | undefined): number => (v == null ? 0 : s(v) + 1);
	const num = (v: number | null | undefined): number => (v == null ? 0 : v + 1);
	const raw = Object.fromEntries(COLUMNS.map((c) => [c, [] as number[]])) as Record<Column, number[]>;
	for (const f of p.fixtures) {
		const c = f.control;
		const { kind, ...rest } = c as FixtureControl & Record<string, unknown>;
		const refKey = kind === 'manual' ? null : REF_KEY[kind];
		const extra: Record<string, unknown> = { ...rest };
		if (refKey) delete extra[refKey];
		if (kind === 'dmx') delete extra.address;
		const row: Record<Column, number> = {
			id: f.id,
			number: f.number,
			label: s(f.label),
			typeId: f.typeId,
			modeId: f.modeId,
			position: s(f.position),
			group: s(f.group),
			linkGroup: opt(f.linkGroup),
			colour: s(f.colour),
			watts: num(f.watts),
			state: s(f.state),
			version: f.version,
			look: s(JSON.stringify(f.look)),
			feed: opt(f.feed === undefined ? null : JSON.stringify(f.feed)),
			kind: s(kind),
			ref: num(refKey ? (rest[refKey] as number) : null),
			address: num(c.kind === 'dmx' ? c.address : null),
			extra: opt(Object.keys(extra).length ? JSON.stringify(extra) : null),
			slots: opt(derivedSlots(f) ? null : JSON.stringify(f.slots)),
			footprint: num(f.footprint),
			breakSlots: opt(f.breakSlots === undefined ? null : JSON.stringify(f.breakSlots))
		};
		for (const col of COLUMNS) raw[col].push(row[col]);
	}
	const columns = {} as Record<Column, number[]>;
	for (const col of COLUMNS) {
		const xs = raw[col];
		columns[col] = xs.every((x) => x === xs[0]) ? xs.slice(0, 1) : xs.map((x, i) => (i === 0 ? x : x - xs[i - 1]));
	}
	return {
		v: 1,
		project: p.project,
		universes: p.universes,
		types: p.types,
		receivers: p.receivers,
		conflicts: p.conflicts,
		strings,
		n: p.fixtures.length,
		columns
	};
}

export function decodeTableFeed(t: TableFeed): PatchData {
	const cols = {} as Record<Column, number[]>;
	for (const col of COLUMNS) {
		const d = t.columns[col];
		if (d.length < t.n) {
			cols[col] = new Array<number>(t.n).fill(d[0]);
			continue;
		}
		const xs = new Array<number>(t.n);
		let acc = 0;
		for (let i = 0; i < t.n; i++) xs[i] = acc += d[i];
		cols[col] = xs;
	}
	const str = (i: number) => t.strings[i];
	const opt = (i: number) => (i === 0 ? null : t.strings[i - 1]);
	const num = (i: number) => (i === 0 ? null : i - 1);
	const parsed = new Map<number, unknown>();
	const json = <T>(i: number): T => {
		if (!parsed.has(i)) parsed.set(i, JSON.parse(t.strings[i]));
		// look, feed and slots objects are shared between rows: rows are replaced, never mutated
		return parsed.get(i) as T;
	};
	const fixtures: Fixture[] = [];
	const n = t.n;
	for (let i = 0; i < n; i++) {
		const kind = str(cols.kind[i]) as FixtureControl['kind'];
		const extraAt = cols.extra[i];
		const extra = extraAt === 0 ? {} : json<Record<string, unknown>>(extraAt - 1);
		const ref = num(cols.ref[i]);
		const control = (
			kind === 'manual'
				? { kind }
				: kind === 'dmx'
					? { kind, universeId: ref, address: num(cols.address[i]), ...extra }
					: { kind, [REF_KEY[kind]]: ref, ...extra }
		) as FixtureControl;
		const footprint = num(cols.footprint[i]);
		const slotsAt = cols.slots[i];
		const address = num(cols.address[i]);
		const feedAt = cols.feed[i];
		const breakAt = cols.breakSlots[i];
		const f: Fixture = {
			id: cols.id[i],
			number: cols.number[i],
			label: str(cols.label[i]),
			typeId: cols.typeId[i],
			modeId: cols.modeId[i],
			position: str(cols.position[i]),
			group: str(cols.group[i]),
			linkGroup: opt(cols.linkGroup[i]),
			colour: str(cols.colour[i]),
			watts: num(cols.watts[i]),
			notes: '',
			state: str(cols.state[i]) as Fixture['state'],
			version: cols.version[i],
			look: json<Fixture['look']>(cols.look[i]),
			control,
			slots:
				slotsAt === 0 ? [{ start: address!, end: address! + footprint! - 1 }] : json<Fixture['slots']>(slotsAt - 1),
			footprint
		};
		if (feedAt !== 0) f.feed = json<NonNullable<Fixture['feed']>>(feedAt - 1);
		if (breakAt !== 0) f.breakSlots = json<NonNullable<Fixture['breakSlots']>>(breakAt - 1);
		fixtures.push(f);
	}
	return {
		project: t.project,
		universes: t.universes,
		types: t.types,
		receivers: t.receivers,
		fixtures,
		conflicts: t.conflicts
	};
}
