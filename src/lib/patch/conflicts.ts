import {
	compileMode,
	formatSlots,
	own,
	resolveDmx,
	resolveDmxMap,
	UNIVERSE_SLOTS,
	type CompiledMode,
	type FootprintProblem
} from './footprint';
import { sweep, type Claim } from './sweep';
import type { Conflict, ConflictKind, Mode, PatchFixture, Receiver, SlotRange, Universe } from './types';

export interface PatchInput {
	universes: readonly Universe[];
	modes: readonly Mode[] | ReadonlyMap<number, Mode>;
	fixtures: readonly PatchFixture[];
	receivers?: readonly Receiver[];
}

export interface FixtureFootprint {
	fixtureId: number;
	/** Footprint length of the mode; null when the mode is unknown. */
	footprint: number | null;
	universeId: number | null;
	/** Claimed slots inside 1–512, as sorted maximal runs. */
	ranges: SlotRange[];
}

export interface PatchAnalysis {
	/** One entry per fixture, in fixture-number order. */
	footprints: FixtureFootprint[];
	conflicts: Conflict[];
}

// EIA-485: 32 unit loads per segment without a splitter. One line per universe is the common
// practice assumption; a rig that splits a universe onto several lines may carry more.
export const UNITS_PER_LINE = 32;

const SEVERITY_RANK = { error: 0, warning: 1, info: 2 } as const;
const KIND_RANK: Record<ConflictKind, number> = {
	'out-of-range': 0,
	overflow: 1,
	overlap: 2,
	'rc-collision': 3,
	shared: 4,
	'rc-unassigned': 5,
	'line-overload': 6,
	linked: 7
};
const SEVERITY: Record<ConflictKind, Conflict['severity']> = {
	'out-of-range': 'error',
	overflow: 'error',
	overlap: 'error',
	'rc-collision': 'error',
	shared: 'warning',
	'rc-unassigned': 'warning',
	'line-overload': 'warning',
	linked: 'info'
};

function isModeMap(m: readonly Mode[] | ReadonlyMap<number, Mode>): m is ReadonlyMap<number, Mode> {
	return m instanceof Map;
}

function byNumber(a: PatchFixture, b: PatchFixture): number {
	return a.number - b.number || a.id - b.id;
}

function listNumbers(fixtures: readonly PatchFixture[]): string {
	const nums = fixtures.map((f) => f.number);
	if (nums.length === 1) return `${nums[0]}`;
	return `${nums.slice(0, -1).join(', ')} and ${nums[nums.length - 1]}`;
}

function receiverName(r: Receiver): string {
	return r.name !== undefined && r.name !== '' ? `receiver "${r.name}"` : `receiver ${r.id}`;
}

function sortedByNumber(fixtures: readonly PatchFixture[]): readonly PatchFixture[] {
	// Databases usually answer in number order already; check before paying for a sort.
	for (let i = 1; i < fixtures.length; i++)
		if (byNumber(fixtures[i - 1], fixtures[i]) > 0) return [...fixtures].sort(byNumber);
	return fixtures;
}

/**
 * Footprints, slot claims and every conflict of a patch, computed in one pass. `footprints: false`
 * skips the per-fixture list when only conflicts are wanted (it is most of the allocation).
 */
export function analysePatch(
	input: PatchInput,
	{ footprints: wantFootprints = true }: { footprints?: boolean } = {}
): PatchAnalysis {
	const modes = isModeMap(input.modes) ? input.modes : new Map(input.modes.map((m) => [m.id, m]));
	const compiled = new Map<number, CompiledMode>();
	for (const [id, m] of modes) compiled.set(id, compileMode(m));
	const universes = [...input.universes].sort((a, b) => a.number - b.number || a.id - b.id);
	const universeIndex = new Map<number, number>();
	universes.forEach((u, i) => universeIndex.set(u.id, i));
	const fixtures = sortedByNumber(input.fixtures);

	const conflicts: Conflict[] = [];
	// Numbers of the fixtures named in conflicts, for ordering them without indexing every fixture.
	const numbers = new Map<number, number>();
	const add = (
		kind: ConflictKind,
		on: readonly PatchFixture[],
		message: string,
		extra: Partial<Conflict> = {}
	): void => {
		for (const f of on) numbers.set(f.id, f.number);
		conflicts.push({ kind, severity: SEVERITY[kind], ...extra, fixtureIds: on.map((f) => f.id), message });
	};

	const footprints: FixtureFootprint[] = [];
	const claims: Claim[] = [];
	const claimFixture: PatchFixture[] = [];
	const unitsOn = new Int32Array(universes.length);
	const rcFixtures: PatchFixture[] = [];
	const followers: PatchFixture[] = [];
	for (const f of fixtures) {
		const c = f.control;
		const mode = compiled.get(f.modeId);
		const entry: FixtureFootprint | undefined = wantFootprints
			? {
					fixtureId: f.id,
					footprint: mode === undefined ? null : mode.slotCount,
					universeId: c.kind === 'dmx' || c.kind === 'dmx-map' ? c.universeId : null,
					ranges: []
				}
			: undefined;
		if (entry !== undefined) footprints.push(entry);
		if (c.kind !== 'dmx' && c.kind !== 'dmx-map') {
			if (c.kind === 'rc') rcFixtures.push(f);
			else if (c.kind === 'follow') followers.push(f);
			continue;
		}
		const ui = c.universeId === null ? undefined : universeIndex.get(c.universeId);
		if (ui === undefined) {
			add(
				'out-of-range',
				[f],
				c.universeId === null
					? `Fixture ${f.number} has no universe — choose one.`
					: `Fixture ${f.number} points at universe id ${c.universeId}, which is not in this project — choose another.`
			);
			continue;
		}
		unitsOn[ui]++;
		if (mode === undefined) continue;
		const resolved = c.kind === 'dmx' ? resolveDmx(c.address, mode.slotCount) : resolveDmxMap(c.addresses, mode);
		for (const p of resolved.problems) reportFootprint(add, f, universes[ui], mode.slotCount, p);
		if (entry !== undefined) entry.ranges = resolved.runs;
		if (resolved.runs.length > 0) {
			claims.push({ universe: ui, runs: resolved.runs });
			claimFixture.push(f);
		}
	}

	const sameLayout = (a: number, b: number): boolean => {
		const fa = claimFixture[a];
		const fb = claimFixture[b];
		const ca = fa.control;
		const cb = fb.control;
		if (fa.modeId !== fb.modeId || fa.typeId !== fb.typeId) return false;
		if (ca.kind === 'dmx' && cb.kind === 'dmx') return ca.address === cb.address;
		if (ca.kind !== 'dmx-map' || cb.kind !== 'dmx-map') return false;
		const mode = modes.get(fa.modeId);
		if (mode === undefined) return false;
		// Same mode and the same address for every parameter: the units read identical slots.
		return mode.channels.every(
			(ch) => ch.offset === null || own(ca.addresses, ch.parameter) === own(cb.addresses, ch.parameter)
		);
	};
	const swept = sweep(claims, sameLayout);
	for (const { a, b, slots } of swept.overlaps) {
		const u = universes[claims[a].universe];
		add(
			'overlap',
			[claimFixture[a], claimFixture[b]],
			`Fixtures ${claimFixture[a].number} and ${claimFixture[b].number} both claim ${slots.length === 1 ? 'slot' : 'slots'} ${formatSlots(slots)} of universe ${u.number} — move one.`,
			{ universeId: u.id, slots }
		);
	}
	for (const stack of swept.stacks) {
		const on = stack.map((ci) => claimFixture[ci]);
		const u = universes[claims[stack[0]].universe];
		const start = claims[stack[0]].runs[0].start;
		const group = on[0].linkGroup;
		const where = `universe ${u.number} address ${start}`;
		if (group !== null && on.every((f) => f.linkGroup === group)) {
			add('linked', on, `Fixtures ${listNumbers(on)} are linked (group "${group}") on ${where}.`, {
				universeId: u.id,
				slots: [start]
			});
		} else {
			add(
				'shared',
				on,
				`Fixtures ${listNumbers(on)} share ${where} in the same mode but are not in one link group — declare a link group if they should move together, or move one.`,
				{ universeId: u.id, slots: [start] }
			);
		}
	}

	checkRc(rcFixtures, modes, input.receivers ?? [], add);
	checkLines(followers, fixtures, universes, universeIndex, unitsOn, add);

	const numberOf = (id: number): number => numbers.get(id) ?? 0;
	const universeRank = new Map<number, number>();
	universes.forEach((u, i) => universeRank.set(u.id, i));
	for (const c of conflicts) c.fixtureIds.sort((x, y) => numberOf(x) - numberOf(y) || x - y);
	conflicts.sort((x, y) => compareConflicts(x, y, universeRank, numberOf));
	return { footprints, conflicts };
}

/** Every conflict of a patch, in a stable order: errors first, then by universe, slot and fixture. */
export function findConflicts(input: PatchInput): Conflict[] {
	return analysePatch(input, { footprints: false }).conflicts;
}

type Add = (kind: ConflictKind, on: readonly PatchFixture[], message: string, extra?: Partial<Conflict>) => void;

function reportFootprint(add: Add, f: PatchFixture, u: Universe, footprint: number, p: FootprintProblem): void {
	const at = `universe ${u.number}`;
	if (p.kind === 'self-overlap') {
		add(
			'overlap',
			[f],
			`Fixture ${f.number} maps ${p.parameters.join(' and ')} onto ${p.slots.length === 1 ? 'slot' : 'slots'} ${formatSlots(p.slots)} of ${at} — give each parameter its own address.`,
			{ universeId: u.id, slots: p.slots }
		);
	} else if (p.kind === 'overflow') {
		const fix =
			p.needs > UNIVERSE_SLOTS
				? 'it needs more slots than a universe holds — choose a smaller mode'
				: `start it at ${UNIVERSE_SLOTS + 1 - p.needs} or lower`;
		const what =
			p.parameter === undefined
				? `needs ${p.needs} slots from address ${p.address}`
				: `puts ${p.parameter} (${p.needs} slots) at ${p.address}`;
		const slots: number[] = [];
		for (let s = p.address; s <= UNIVERSE_SLOTS; s++) slots.push(s);
		add('overflow', [f], `Fixture ${f.number} ${what} of ${at}, running to slot ${p.lastSlot} past 512 — ${fix}.`, {
			universeId: u.id,
			slots
		});
	} else if (p.parameter === undefined) {
		const last = footprint > 0 && footprint <= UNIVERSE_SLOTS ? UNIVERSE_SLOTS + 1 - footprint : UNIVERSE_SLOTS;
		add(
			'out-of-range',
			[f],
			`Fixture ${f.number} has address ${p.address ?? 'none'} in ${at}, outside 1–512 — pick 1–${last}.`,
			{ universeId: u.id }
		);
	} else if (p.address === null) {
		add(
			'out-of-range',
			[f],
			`Fixture ${f.number} has no address for ${p.parameter} in ${at} — give it one from 1 to 512.`,
			{ universeId: u.id }
		);
	} else {
		add(
			'out-of-range',
			[f],
			`Fixture ${f.number} puts ${p.parameter} at ${p.address} in ${at}, outside 1–512 — pick 1–512.`,
			{ universeId: u.id }
		);
	}
}

function checkRc(
	fixtures: readonly PatchFixture[],
	modes: ReadonlyMap<number, Mode>,
	receiverList: readonly Receiver[],
	add: Add
): void {
	const receivers = new Map(receiverList.map((r) => [r.id, r]));
	// receiverId → channel → who drives it; a link group drives as one.
	const drivers = new Map<number, Map<number, { driver: string; parameter: string; fixture: PatchFixture }[]>>();
	for (const f of fixtures) {
		const c = f.control;
		if (c.kind !== 'rc') continue;
		const r = c.receiverId === null ? undefined : receivers.get(c.receiverId);
		if (r === undefined) {
			add(
				'rc-unassigned',
				[f],
				c.receiverId === null
					? `Fixture ${f.number} is on RC but has no receiver — choose one.`
					: `Fixture ${f.number} points at receiver id ${c.receiverId}, which is not in this project — choose another.`
			);
			continue;
		}
		const mode = modes.get(f.modeId);
		const params = mode === undefined ? Object.keys(c.channels) : [...new Set(mode.channels.map((ch) => ch.parameter))];
		const missing: string[] = [];
		const beyond: { parameter: string; channel: number }[] = [];
		for (const p of params) {
			const ch = own(c.channels, p);
			if (ch === undefined) missing.push(p);
			else if (!Number.isInteger(ch) || ch < 1 || ch > r.channelCount) beyond.push({ parameter: p, channel: ch });
			else {
				let byChannel = drivers.get(r.id);
				if (byChannel === undefined) drivers.set(r.id, (byChannel = new Map()));
				const list = byChannel.get(ch) ?? [];
				byChannel.set(ch, list);
				list.push({
					driver: `${f.linkGroup === null ? `#${f.id}` : `group:${f.linkGroup}`}|${p}`,
					parameter: p,
					fixture: f
				});
			}
		}
		if (missing.length > 0) {
			add(
				'rc-unassigned',
				[f],
				`Fixture ${f.number} has no channel on ${receiverName(r)} for ${missing.join(', ')} — assign one.`,
				{ receiverId: r.id }
			);
		}
		if (beyond.length > 0) {
			const what = beyond.map((b) => `${b.parameter} on ${b.channel}`).join(', ');
			add(
				'rc-unassigned',
				[f],
				`Fixture ${f.number} has ${what}, but ${receiverName(r)} has channels 1–${r.channelCount} — pick one in range.`,
				{ receiverId: r.id, channels: beyond.map((b) => b.channel) }
			);
		}
	}
	for (const [rid, byChannel] of drivers) {
		const r = receivers.get(rid);
		if (r === undefined) continue;
		for (const [ch, list] of [...byChannel].sort((a, b) => a[0] - b[0])) {
			if (new Set(list.map((d) => d.driver)).size < 2) continue;
			const on = [...new Set(list.map((d) => d.fixture))];
			const what = list.map((d) => `${d.parameter} of fixture ${d.fixture.number}`).join(', ');
			add(
				'rc-collision',
				on,
				`Channel ${ch} of ${receiverName(r)} drives ${what} — give each parameter its own channel, or link the fixtures.`,
				{ receiverId: r.id, channels: [ch] }
			);
		}
	}
}

function checkLines(
	followers: readonly PatchFixture[],
	fixtures: readonly PatchFixture[],
	universes: readonly Universe[],
	universeIndex: ReadonlyMap<number, number>,
	unitsOn: Int32Array,
	add: Add
): void {
	const lineOf = (f: PatchFixture): number | undefined => {
		const c = f.control;
		return (c.kind === 'dmx' || c.kind === 'dmx-map') && c.universeId !== null
			? universeIndex.get(c.universeId)
			: undefined;
	};
	// A follower is daisy-chained from its leader, so it is a unit load on the leader's line.
	const byId = new Map<number, PatchFixture>();
	if (followers.length > 0) for (const f of fixtures) byId.set(f.id, f);
	const followerLine = new Map<PatchFixture, number>();
	for (const f of followers) {
		if (f.control.kind !== 'follow') continue;
		const seen = new Set<number>([f.id]);
		let leader = byId.get(f.control.leaderId);
		while (leader !== undefined && leader.control.kind === 'follow' && !seen.has(leader.id)) {
			seen.add(leader.id);
			leader = byId.get(leader.control.leaderId);
		}
		const ui = leader === undefined ? undefined : lineOf(leader);
		if (ui === undefined) continue;
		followerLine.set(f, ui);
		unitsOn[ui]++;
	}
	// Fixtures are gathered per line only once a line is known to be overloaded.
	const overloaded = new Map<number, PatchFixture[]>();
	universes.forEach((u, i) => {
		if (u.transport === 'dmx-wired' && unitsOn[i] > UNITS_PER_LINE) overloaded.set(i, []);
	});
	if (overloaded.size === 0) return;
	for (const f of fixtures) overloaded.get(lineOf(f) ?? followerLine.get(f) ?? -1)?.push(f);
	for (const [i, on] of overloaded) {
		const u = universes[i];
		add(
			'line-overload',
			on,
			`Universe ${u.number} (wired DMX) carries ${on.length} units on one line; EIA-485 allows ${UNITS_PER_LINE} unit loads per segment — add a splitter or move fixtures.`,
			{ universeId: u.id }
		);
	}
}

function compareConflicts(
	x: Conflict,
	y: Conflict,
	universeRank: ReadonlyMap<number, number>,
	numberOf: (id: number) => number
): number {
	const d =
		SEVERITY_RANK[x.severity] - SEVERITY_RANK[y.severity] ||
		KIND_RANK[x.kind] - KIND_RANK[y.kind] ||
		(x.universeId === undefined ? -1 : (universeRank.get(x.universeId) ?? -1)) -
			(y.universeId === undefined ? -1 : (universeRank.get(y.universeId) ?? -1)) ||
		(x.receiverId ?? -1) - (y.receiverId ?? -1) ||
		(x.slots?.[0] ?? x.channels?.[0] ?? 0) - (y.slots?.[0] ?? y.channels?.[0] ?? 0);
	if (d !== 0) return d;
	const n = Math.min(x.fixtureIds.length, y.fixtureIds.length);
	for (let i = 0; i < n; i++) {
		const e = numberOf(x.fixtureIds[i]) - numberOf(y.fixtureIds[i]) || x.fixtureIds[i] - y.fixtureIds[i];
		if (e !== 0) return e;
	}
	return x.fixtureIds.length - y.fixtureIds.length || (x.message < y.message ? -1 : x.message > y.message ? 1 : 0);
}
