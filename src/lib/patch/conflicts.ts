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
	/** Footprint length of the mode (of its break 1); null when the mode is unknown. */
	footprint: number | null;
	universeId: number | null;
	/** Claimed slots inside 1–512, as sorted maximal runs. */
	ranges: SlotRange[];
	/** Breaks 2…n of a multi-break mode, each on its own start address; absent for one break. */
	breaks?: BreakFootprint[];
}

export interface BreakFootprint {
	dmxBreak: number;
	footprint: number;
	universeId: number | null;
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
	'unknown-mode': 0,
	'missing-leader': 1,
	'follow-cycle': 2,
	'out-of-range': 3,
	overflow: 4,
	overlap: 5,
	'rc-collision': 6,
	shared: 7,
	'link-mismatch': 8,
	'rc-unassigned': 9,
	'line-overload': 10,
	linked: 11
};
/** What people read for each kind on pages; the codes stay in the API. */
export const CONFLICT_KIND_LABELS: Record<ConflictKind, string> = {
	'unknown-mode': 'Unknown mode',
	'missing-leader': 'Leader missing',
	'follow-cycle': 'Followers in a loop',
	'out-of-range': 'Address out of range',
	overflow: 'Past slot 512',
	overlap: 'Overlap',
	'rc-collision': 'Radio channel clash',
	shared: 'Shared slots',
	'link-mismatch': 'Link group mismatch',
	'rc-unassigned': 'No radio channel',
	'line-overload': 'Line overloaded',
	linked: 'Link group'
};
const SEVERITY: Record<ConflictKind, Conflict['severity']> = {
	'unknown-mode': 'error',
	'missing-leader': 'error',
	'follow-cycle': 'error',
	'out-of-range': 'error',
	overflow: 'error',
	overlap: 'error',
	'rc-collision': 'error',
	shared: 'warning',
	'link-mismatch': 'warning',
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
	// Per claim: its DMX break and start address, so stacking compares like with like.
	const claimBreak: number[] = [];
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
		if (mode === undefined) {
			add(
				'unknown-mode',
				[f],
				`Fixture ${f.number} uses mode id ${f.modeId}, which its type does not have, so it claims no slots — choose a mode.`
			);
		}
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
			claimBreak.push(1);
		}
		if (c.kind !== 'dmx' || mode.moreBreaks.length === 0) continue;
		// GDTF DMX breaks: each further break starts at its own universe and address (DIN SPEC 15800 DMX mode)
		const more: BreakFootprint[] = [];
		for (const { dmxBreak, slots } of mode.moreBreaks) {
			const b = c.breaks?.find((x) => x.dmxBreak === dmxBreak);
			const bf: BreakFootprint = { dmxBreak, footprint: slots, universeId: b?.universeId ?? null, ranges: [] };
			more.push(bf);
			const bi = b === undefined || b.universeId === null ? undefined : universeIndex.get(b.universeId);
			if (b === undefined || bi === undefined) {
				add(
					'out-of-range',
					[f],
					b === undefined || b.universeId === null
						? `Fixture ${f.number} has no universe and address for DMX break ${dmxBreak} (${slots} slots) — give it one.`
						: `Fixture ${f.number} puts DMX break ${dmxBreak} on universe id ${b.universeId}, which is not in this project — choose another.`
				);
				continue;
			}
			if (bi !== ui) unitsOn[bi]++;
			const r = resolveDmx(b.address, slots);
			for (const p of r.problems) reportFootprint(add, f, universes[bi], slots, p, dmxBreak);
			bf.ranges = r.runs;
			if (r.runs.length > 0) {
				claims.push({ universe: bi, runs: r.runs });
				claimFixture.push(f);
				claimBreak.push(dmxBreak);
			}
		}
		if (entry !== undefined) entry.breaks = more;
	}

	const sameLayout = (a: number, b: number): boolean => {
		const fa = claimFixture[a];
		const fb = claimFixture[b];
		const ca = fa.control;
		const cb = fb.control;
		if (fa === fb || fa.modeId !== fb.modeId || fa.typeId !== fb.typeId || claimBreak[a] !== claimBreak[b])
			return false;
		if (ca.kind === 'dmx' && cb.kind === 'dmx') return claims[a].runs[0].start === claims[b].runs[0].start;
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
		const what = `${slots.length === 1 ? 'slot' : 'slots'} ${formatSlots(slots)} of universe ${u.number}`;
		const fa = claimFixture[a];
		const fb = claimFixture[b];
		const nameOf = (ci: number) =>
			claimBreak[ci] === 1 && !hasBreaks(claimFixture[ci])
				? `${claimFixture[ci].number}`
				: `${claimFixture[ci].number} (break ${claimBreak[ci]})`;
		add(
			'overlap',
			fa === fb ? [fa] : [fa, fb],
			fa === fb
				? `Fixture ${fa.number} puts DMX breaks ${claimBreak[a]} and ${claimBreak[b]} on the same ${what} — move one break.`
				: `Fixtures ${nameOf(a)} and ${nameOf(b)} both claim ${what} — move one.`,
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
	checkFollows(followers, fixtures, add);
	checkLinkGroups(fixtures, universes, universeIndex, add);
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

function hasBreaks(f: PatchFixture): boolean {
	return f.control.kind === 'dmx' && f.control.breaks !== undefined && f.control.breaks.length > 0;
}

/**
 * A follower is daisy-chained behind its leader (common practice): the leader must exist, and a
 * chain of followers must end at a fixture that is addressed, not loop back on itself.
 */
function checkFollows(followers: readonly PatchFixture[], fixtures: readonly PatchFixture[], add: Add): void {
	if (followers.length === 0) return;
	const byId = new Map<number, PatchFixture>();
	for (const f of fixtures) byId.set(f.id, f);
	const reported = new Set<number>();
	for (const f of followers) {
		if (f.control.kind !== 'follow') continue;
		const leader = byId.get(f.control.leaderId);
		if (leader === undefined) {
			add(
				'missing-leader',
				[f],
				`Fixture ${f.number} follows fixture id ${f.control.leaderId}, which is not in this project — choose a leader or give it its own address.`
			);
			continue;
		}
		if (reported.has(f.id)) continue;
		// Walk the chain; a cycle is reported once, naming every fixture on it.
		const path: PatchFixture[] = [];
		const at = new Map<number, number>();
		let cur: PatchFixture | undefined = f;
		while (cur !== undefined && cur.control.kind === 'follow' && !at.has(cur.id) && !reported.has(cur.id)) {
			at.set(cur.id, path.length);
			path.push(cur);
			cur = byId.get(cur.control.leaderId);
		}
		if (cur === undefined || !at.has(cur.id)) continue;
		const cycle = path.slice(at.get(cur.id));
		for (const c of cycle) reported.add(c.id);
		const sorted = [...cycle].sort(byNumber);
		add(
			'follow-cycle',
			sorted,
			cycle.length === 1
				? `Fixture ${f.number} follows itself, so nothing drives it — give it a leader or its own address.`
				: `Fixtures ${listNumbers(sorted)} follow each other in a circle, so nothing drives them — give one of them its own address.`
		);
	}
}

/** Members of a link group move as one, so they must share universe, address and mode (DESIGN "Link groups"). */
function checkLinkGroups(
	fixtures: readonly PatchFixture[],
	universes: readonly Universe[],
	universeIndex: ReadonlyMap<number, number>,
	add: Add
): void {
	const groups = new Map<string, PatchFixture[]>();
	for (const f of fixtures) {
		if (f.linkGroup === null) continue;
		const g = groups.get(f.linkGroup);
		if (g === undefined) groups.set(f.linkGroup, [f]);
		else g.push(f);
	}
	const universeOf = (f: PatchFixture): string => {
		const c = f.control;
		if (c.kind !== 'dmx' && c.kind !== 'dmx-map') return c.kind;
		const ui = c.universeId === null ? undefined : universeIndex.get(c.universeId);
		return ui === undefined ? 'no universe' : `universe ${universes[ui].number}`;
	};
	const addressOf = (f: PatchFixture): string => {
		const c = f.control;
		if (c.kind === 'dmx') return `address ${c.address}`;
		if (c.kind === 'dmx-map') return `addresses ${JSON.stringify(c.addresses)}`;
		if (c.kind === 'follow') return `leader ${c.leaderId}`;
		return c.kind === 'rc' ? `receiver ${c.receiverId}` : '';
	};
	for (const [name, on] of groups) {
		if (on.length < 2) continue;
		const diffs: string[] = [];
		const first = on[0];
		if (on.some((f) => f.typeId !== first.typeId || f.modeId !== first.modeId)) diffs.push('mode');
		if (on.some((f) => universeOf(f) !== universeOf(first))) diffs.push('universe');
		if (on.some((f) => addressOf(f) !== addressOf(first))) diffs.push('address');
		if (diffs.length === 0) continue;
		const list = on.map((f) => `${f.number}: ${universeOf(f)} ${addressOf(f)}`.trim()).join('; ');
		add(
			'link-mismatch',
			on,
			`Link group "${name}" has fixtures ${listNumbers(on)} that differ in ${diffs.join(' and ')} (${list}) — linked fixtures share universe, address and mode; make them match or take one out of the group.`
		);
	}
}

function reportFootprint(
	add: Add,
	f: PatchFixture,
	u: Universe,
	footprint: number,
	p: FootprintProblem,
	dmxBreak = 1
): void {
	const at = dmxBreak === 1 ? `universe ${u.number}` : `universe ${u.number} (DMX break ${dmxBreak})`;
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
