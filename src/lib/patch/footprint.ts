import type { Bits, DmxControl, DmxMapControl, Mode, SlotRange } from './types';

// ANSI E1.11: a DMX512 universe carries 512 data slots after the start code.
export const UNIVERSE_SLOTS = 512;

/** Slots one channel occupies: 8-bit 1, 16-bit coarse + fine 2, 24-bit 3. */
export function bytesOf(bits: Bits): number {
	return bits >> 3;
}

/**
 * Footprint length: from offset 1 to the last slot of the highest channel. Gaps still belong
 * to the footprint (the fixture reads them); virtual channels (offset null) take none.
 */
export function modeSlotCount(mode: Mode): number {
	let last = 0;
	for (const ch of mode.channels) {
		if (ch.offset === null) continue;
		const end = ch.offset + bytesOf(ch.bits) - 1;
		if (end > last) last = end;
	}
	return Math.max(last, mode.slots ?? 0);
}

export interface ParameterSlots {
	parameter: string;
	bits: Bits;
	/** Slots in byte order (coarse first); empty for a virtual channel or a missing map entry. */
	slots: number[];
}

/** Which slots each parameter uses — for the universe map's "hover names the slot". */
export function parameterSlots(control: DmxControl | DmxMapControl, mode: Mode): ParameterSlots[] {
	const out: ParameterSlots[] = [];
	for (const ch of mode.channels) {
		let first: number | undefined;
		if (ch.offset !== null) {
			first = control.kind === 'dmx' ? control.address + ch.offset - 1 : own(control.addresses, ch.parameter);
		}
		const slots: number[] = [];
		if (first !== undefined) for (let i = 0; i < bytesOf(ch.bits); i++) slots.push(first + i);
		out.push({ parameter: ch.parameter, bits: ch.bits, slots });
	}
	return out;
}

export type FootprintProblem =
	| { kind: 'out-of-range'; parameter?: string; address: number | null }
	| { kind: 'overflow'; parameter?: string; address: number; needs: number; lastSlot: number }
	| { kind: 'self-overlap'; slots: number[]; parameters: string[] };

export interface ResolvedFootprint {
	/** Claimed slots inside 1–512 as sorted, disjoint, maximal runs (an overflow is clipped at 512). */
	runs: SlotRange[];
	problems: FootprintProblem[];
}

/** Own-property lookup: parameter names are free text, so "constructor" must not hit the prototype. */
export function own<T>(rec: Readonly<Record<string, T>>, key: string): T | undefined {
	return Object.prototype.hasOwnProperty.call(rec, key) ? rec[key] : undefined;
}

function isAddress(a: number): boolean {
	return Number.isInteger(a) && a >= 1 && a <= UNIVERSE_SLOTS;
}

/** Contiguous footprint from the start address. */
export function resolveDmx(address: number, slotCount: number): ResolvedFootprint {
	if (!isAddress(address)) return { runs: [], problems: [{ kind: 'out-of-range', address }] };
	if (slotCount === 0) return { runs: [], problems: [] };
	const last = address + slotCount - 1;
	if (last > UNIVERSE_SLOTS) {
		return {
			runs: [{ start: address, end: UNIVERSE_SLOTS }],
			problems: [{ kind: 'overflow', address, needs: slotCount, lastSlot: last }]
		};
	}
	return { runs: [{ start: address, end: last }], problems: [] };
}

/** Union of each parameter's slots; a 16-bit parameter at a takes a and a + 1. */
export function resolveDmxMap(addresses: Readonly<Record<string, number>>, mode: Mode): ResolvedFootprint {
	const problems: FootprintProblem[] = [];
	const slots: number[] = [];
	const seen = new Set<string>();
	for (const ch of mode.channels) {
		if (ch.offset === null || seen.has(ch.parameter)) continue;
		seen.add(ch.parameter);
		const a = own(addresses, ch.parameter);
		if (a === undefined || !isAddress(a)) {
			problems.push({ kind: 'out-of-range', parameter: ch.parameter, address: a ?? null });
			continue;
		}
		const n = bytesOf(ch.bits);
		const last = a + n - 1;
		if (last > UNIVERSE_SLOTS) {
			problems.push({ kind: 'overflow', parameter: ch.parameter, address: a, needs: n, lastSlot: last });
		}
		for (let s = a; s <= Math.min(last, UNIVERSE_SLOTS); s++) slots.push(s);
	}
	slots.sort((x, y) => x - y);
	const runs: SlotRange[] = [];
	const doubled: number[] = [];
	for (const s of slots) {
		const run = runs[runs.length - 1];
		if (run !== undefined && s <= run.end) {
			if (doubled[doubled.length - 1] !== s) doubled.push(s);
		} else if (run !== undefined && s === run.end + 1) run.end = s;
		else runs.push({ start: s, end: s });
	}
	if (doubled.length > 0) {
		const doubledSet = new Set(doubled);
		const names = parameterSlots({ kind: 'dmx-map', universeId: null, addresses }, mode)
			.filter((p) => p.slots.some((s) => doubledSet.has(s)))
			.map((p) => p.parameter);
		problems.push({ kind: 'self-overlap', slots: doubled, parameters: names });
	}
	return { runs, problems };
}

/** Every slot in the runs, ascending. */
export function expandRanges(runs: readonly SlotRange[]): number[] {
	const out: number[] = [];
	for (const r of runs) for (let s = r.start; s <= r.end; s++) out.push(s);
	return out;
}

/** Sorted slot numbers → maximal runs. */
export function compactSlots(slots: readonly number[]): SlotRange[] {
	const sorted = [...slots].sort((a, b) => a - b);
	const runs: SlotRange[] = [];
	for (const s of sorted) {
		const run = runs[runs.length - 1];
		if (run !== undefined && s <= run.end + 1) run.end = Math.max(run.end, s);
		else runs.push({ start: s, end: s });
	}
	return runs;
}

/** "5–8, 10" — how a person reads a slot list. */
export function formatSlots(slots: readonly number[]): string {
	return compactSlots(slots)
		.map((r) => (r.start === r.end ? `${r.start}` : `${r.start}–${r.end}`))
		.join(', ');
}
