import { UNIVERSE_SLOTS } from './footprint';
import type { SlotRange } from './types';

export interface AutoAddressFixture {
	id: number;
	number: number;
	/** Footprint length in slots. */
	slots: number;
}

/** Something already patched: a run of slots, or a sparse set of slots (a dmx-map fixture). */
export type Occupied = SlotRange | readonly number[];

export interface AutoAddressOptions {
	/** Lowest address to use, 1–512 (default 1). */
	start?: number;
	/** Start each fixture on an address ≡ 1 (mod align): 10 → 1, 11, 21 …; 100 → 1, 101, 201 … */
	align?: number;
	/**
	 * Free slots reserved after each placed fixture. Reserved only where free: the gap may be
	 * cut short by an already-patched fixture or by slot 512.
	 */
	gap?: number;
}

export interface AutoAddressInput extends AutoAddressOptions {
	fixtures: readonly AutoAddressFixture[];
	occupied?: readonly Occupied[];
	/** How reasons name the universe ("universe 3"). */
	universeLabel?: string;
}

export interface Unplaced {
	fixtureId: number;
	reason: string;
}

export interface AutoAddressResult {
	placed: { fixtureId: number; address: number }[];
	unplaced: Unplaced[];
}

function checkOptions(o: AutoAddressOptions): Required<AutoAddressOptions> {
	const start = o.start ?? 1;
	const align = o.align ?? 1;
	const gap = o.gap ?? 0;
	if (!Number.isInteger(start) || start < 1 || start > UNIVERSE_SLOTS)
		throw new RangeError(`start ${start} is outside 1–512`);
	if (!Number.isInteger(align) || align < 1 || align > UNIVERSE_SLOTS)
		throw new RangeError(`align ${align} is not 1–512`);
	if (!Number.isInteger(gap) || gap < 0) throw new RangeError(`gap ${gap} is not a slot count`);
	return { start, align, gap };
}

/**
 * Free runs of one universe at and above `start`, kept sorted; first fit scans them in address
 * order. A universe has at most 256 free runs, so a placement is O(256) whatever the batch size,
 * and `largest` rejects a fixture that cannot fit anywhere in O(1).
 */
class FreeRuns {
	starts: number[] = [];
	ends: number[] = [];
	largest = 0;

	constructor(occupied: readonly Occupied[], start: number) {
		const taken = new Uint8Array(UNIVERSE_SLOTS + 2);
		for (const o of occupied) {
			if ('start' in o) {
				for (let s = Math.max(o.start, 1); s <= Math.min(o.end, UNIVERSE_SLOTS); s++) taken[s] = 1;
			} else {
				for (const s of o) if (s >= 1 && s <= UNIVERSE_SLOTS) taken[s] = 1;
			}
		}
		taken[UNIVERSE_SLOTS + 1] = 1;
		let runStart = -1;
		for (let s = start; s <= UNIVERSE_SLOTS + 1; s++) {
			if (taken[s] === 0 && runStart < 0) runStart = s;
			else if (taken[s] === 1 && runStart >= 0) {
				this.starts.push(runStart);
				this.ends.push(s - 1);
				runStart = -1;
			}
		}
		this.measure();
	}

	private measure(): void {
		let m = 0;
		for (let i = 0; i < this.starts.length; i++) m = Math.max(m, this.ends[i] - this.starts[i] + 1);
		this.largest = m;
	}

	/** Copy of the runs, so a fixture placed break by break can be taken back whole. */
	save(): { starts: number[]; ends: number[]; largest: number } {
		return { starts: [...this.starts], ends: [...this.ends], largest: this.largest };
	}

	restore(saved: { starts: number[]; ends: number[]; largest: number }): void {
		this.starts = [...saved.starts];
		this.ends = [...saved.ends];
		this.largest = saved.largest;
	}

	/** First aligned address at or above `from` with `slots` free slots, reserving them plus the gap; null if none. */
	take(slots: number, align: number, gap: number, from = 1): number | null {
		if (slots > this.largest) return null;
		for (let i = 0; i < this.starts.length; i++) {
			const e = this.ends[i];
			if (e < from) continue;
			const s = Math.max(this.starts[i], from);
			const a = s + ((align - ((s - 1) % align)) % align);
			if (a + slots - 1 > e) continue;
			const reservedEnd = Math.min(a + slots - 1 + gap, e);
			const pieces: [number, number][] = [];
			if (a > this.starts[i]) pieces.push([this.starts[i], a - 1]);
			if (reservedEnd < e) pieces.push([reservedEnd + 1, e]);
			this.starts.splice(i, 1, ...pieces.map((p) => p[0]));
			this.ends.splice(i, 1, ...pieces.map((p) => p[1]));
			this.measure();
			return a;
		}
		return null;
	}
}

function byNumber(a: AutoAddressFixture, b: AutoAddressFixture): number {
	return a.number - b.number || a.id - b.id;
}

function badFootprint(f: AutoAddressFixture): string | null {
	if (!Number.isInteger(f.slots) || f.slots < 0) return `footprint ${f.slots} is not a slot count`;
	if (f.slots === 0) return 'takes no DMX slots; nothing to address';
	if (f.slots > UNIVERSE_SLOTS) return `needs ${f.slots} slots; a universe has 512`;
	return null;
}

function needs(slots: number): string {
	return `needs ${slots} ${slots === 1 ? 'slot' : 'slots'}`;
}

function noRun(slots: number, o: Required<AutoAddressOptions>, where: string): string {
	const on = o.align > 1 ? ` starting on 1, ${1 + o.align}, ${1 + 2 * o.align} …` : '';
	return `${needs(slots)}; no free run of ${slots}${on} from ${o.start} in ${where}`;
}

/**
 * First fit into one universe in fixture-number order, around what is already patched, never
 * straddling 512 (E1.11: a universe has 512 slots; a footprint does not wrap into the next).
 */
export function autoAddress(input: AutoAddressInput): AutoAddressResult {
	const o = checkOptions(input);
	const free = new FreeRuns(input.occupied ?? [], o.start);
	const where = input.universeLabel ?? 'the universe';
	const result: AutoAddressResult = { placed: [], unplaced: [] };
	for (const f of [...input.fixtures].sort(byNumber)) {
		const bad = badFootprint(f);
		const address = bad === null ? free.take(f.slots, o.align, o.gap) : null;
		if (address !== null) result.placed.push({ fixtureId: f.id, address });
		else result.unplaced.push({ fixtureId: f.id, reason: bad ?? noRun(f.slots, o, where) });
	}
	return result;
}

export interface UniverseTarget {
	universeId: number;
	occupied?: readonly Occupied[];
	/** Lowest address in this universe (default 1). */
	start?: number;
	label?: string;
}

export interface AutoAddressAcrossInput {
	fixtures: readonly AutoAddressFixture[];
	/** Filled in this order. */
	universes: readonly UniverseTarget[];
	align?: number;
	gap?: number;
}

export interface AutoAddressAcrossResult {
	placed: { fixtureId: number; universeId: number; address: number }[];
	unplaced: Unplaced[];
}

/**
 * First fit spilling over a list of universes: each fixture, in number order, goes to the first
 * universe (in list order) with room — the same as filling universe 1, then offering what did not
 * fit to universe 2, and so on.
 */
export function autoAddressAcross(input: AutoAddressAcrossInput): AutoAddressAcrossResult {
	const targets = input.universes.map((u) => {
		const o = checkOptions({ start: u.start, align: input.align, gap: input.gap });
		return { id: u.universeId, o, free: new FreeRuns(u.occupied ?? [], o.start) };
	});
	const align = input.align ?? 1;
	const gap = input.gap ?? 0;
	const result: AutoAddressAcrossResult = { placed: [], unplaced: [] };
	let firstOpen = 0;
	for (const f of [...input.fixtures].sort(byNumber)) {
		const bad = badFootprint(f);
		let placed = false;
		if (bad === null) {
			while (firstOpen < targets.length && targets[firstOpen].free.largest === 0) firstOpen++;
			for (let t = firstOpen; t < targets.length; t++) {
				const address = targets[t].free.take(f.slots, align, gap);
				if (address === null) continue;
				result.placed.push({ fixtureId: f.id, universeId: targets[t].id, address });
				placed = true;
				break;
			}
		}
		if (placed) continue;
		const where =
			targets.length === 0
				? 'no universe'
				: input.universes.length === 1
					? (input.universes[0].label ?? 'the universe')
					: `any of the ${targets.length} universes`;
		const reason =
			bad ??
			`${needs(f.slots)}; no free run of ${f.slots}${align > 1 ? ` on an address ≡ 1 (mod ${align})` : ''} in ${where}`;
		result.unplaced.push({ fixtureId: f.id, reason });
	}
	return result;
}

export interface BreakFixture extends AutoAddressFixture {
	/** Footprints of DMX breaks 2…n of a multi-break mode (DIN SPEC 15800 DMX mode); absent for one break. */
	breaks?: readonly { dmxBreak: number; slots: number }[];
}

export interface AutoAddressBreaksInput extends AutoAddressOptions {
	fixtures: readonly BreakFixture[];
	/** Universe of break 1. */
	universeId: number;
	/** Universe of each further break; a break not listed follows on in break 1's universe. */
	breakUniverses?: Readonly<Record<number, number>>;
	/** What is already patched on each universe involved (fixtures being placed excluded). */
	occupied?: ReadonlyMap<number, readonly Occupied[]>;
	/** How reasons name a universe ("universe 3"). */
	labels?: ReadonlyMap<number, string>;
}

export interface PlacedBreak {
	dmxBreak: number;
	universeId: number;
	address: number;
}

export interface AutoAddressBreaksResult {
	placed: { fixtureId: number; address: number; breaks?: PlacedBreak[] }[];
	unplaced: Unplaced[];
}

/**
 * First fit for fixtures whose mode spans several DMX breaks: break 1 into the chosen universe as
 * `autoAddress` does, then each further break into its own universe (or following on after the
 * previous break when it shares break 1's). A fixture is placed whole or not at all. `start`
 * applies to break 1's universe; another universe is filled from 1.
 */
export function autoAddressBreaks(input: AutoAddressBreaksInput): AutoAddressBreaksResult {
	const o = checkOptions(input);
	const pools = new Map<number, FreeRuns>();
	const pool = (u: number) => {
		let p = pools.get(u);
		if (p === undefined) {
			p = new FreeRuns(input.occupied?.get(u) ?? [], u === input.universeId ? o.start : 1);
			pools.set(u, p);
		}
		return p;
	};
	const label = (u: number) => input.labels?.get(u) ?? 'the universe';
	const result: AutoAddressBreaksResult = { placed: [], unplaced: [] };
	for (const f of [...input.fixtures].sort(byNumber)) {
		const bad = badFootprint(f);
		if (bad !== null) {
			result.unplaced.push({ fixtureId: f.id, reason: bad });
			continue;
		}
		const first = pool(input.universeId);
		const more = [...(f.breaks ?? [])].filter((b) => b.slots > 0).sort((a, b) => a.dmxBreak - b.dmxBreak);
		const saved = new Map<number, ReturnType<FreeRuns['save']>>();
		for (const u of [input.universeId, ...more.map((b) => input.breakUniverses?.[b.dmxBreak] ?? input.universeId)])
			if (!saved.has(u)) saved.set(u, pool(u).save());
		const address = first.take(f.slots, o.align, o.gap);
		if (address === null) {
			result.unplaced.push({ fixtureId: f.id, reason: noRun(f.slots, o, label(input.universeId)) });
			continue;
		}
		const placed: PlacedBreak[] = [];
		const after = new Map<number, number>([[input.universeId, address + f.slots]]);
		let failed: string | null = null;
		for (const b of more) {
			const u = input.breakUniverses?.[b.dmxBreak] ?? input.universeId;
			if (b.slots > UNIVERSE_SLOTS) {
				failed = `break ${b.dmxBreak} needs ${b.slots} slots; a universe has 512`;
				break;
			}
			// following on: a break sharing a universe with an earlier one goes after it where it can
			const from = after.get(u) ?? 1;
			const p = pool(u);
			const a = p.take(b.slots, o.align, o.gap, from) ?? p.take(b.slots, o.align, o.gap);
			if (a === null) {
				const start = u === input.universeId ? o.start : 1;
				failed = `break ${b.dmxBreak} ${noRun(b.slots, { ...o, start }, label(u))}`;
				break;
			}
			placed.push({ dmxBreak: b.dmxBreak, universeId: u, address: a });
			after.set(u, a + b.slots);
		}
		if (failed !== null) {
			for (const [u, s] of saved) pool(u).restore(s);
			result.unplaced.push({ fixtureId: f.id, reason: failed });
			continue;
		}
		result.placed.push(placed.length > 0 ? { fixtureId: f.id, address, breaks: placed } : { fixtureId: f.id, address });
	}
	return result;
}
