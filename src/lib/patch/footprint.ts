import type { Bits, DmxControl, DmxMapControl, Mode, ModeChannel, SlotRange } from './types';

// ANSI E1.11: a DMX512 universe carries 512 data slots after the start code.
export const UNIVERSE_SLOTS = 512;

/** Slots one channel occupies: 8-bit 1, 16-bit coarse + fine 2, 24-bit 3, 32-bit 4. */
export function bytesOf(bits: Bits): number {
	return bits >> 3;
}

/** The DMX break a channel sits on (GDTF DMXChannel DMXBreak, default 1). */
export function breakOf(ch: Pick<ModeChannel, 'dmxBreak'>): number {
	return ch.dmxBreak ?? 1;
}

/** Offsets of every byte of a channel, most significant first (GDTF DMXChannel Offset); [] when virtual. */
export function channelOffsets(ch: Pick<ModeChannel, 'offset' | 'bits' | 'fineOffsets'>): number[] {
	if (ch.offset === null) return [];
	if (ch.fineOffsets !== undefined && ch.fineOffsets.length > 0) return [ch.offset, ...ch.fineOffsets];
	const out: number[] = [];
	for (let i = 0; i < bytesOf(ch.bits); i++) out.push(ch.offset + i);
	return out;
}

/** The mode's breaks in ascending order; a mode always has break 1 (it may be empty). */
export function modeBreaks(mode: Pick<Mode, 'channels'>): number[] {
	const set = new Set<number>([1]);
	for (const ch of mode.channels) if (ch.offset !== null) set.add(breakOf(ch));
	return [...set].sort((a, b) => a - b);
}

/**
 * Footprint length of one break: from offset 1 to its highest used slot. Gaps still belong to the
 * footprint (the fixture reads them); virtual channels (offset null) take none. Break 1 keeps the
 * stored length (reserved trailing slots).
 */
export function modeSlotCount(mode: Mode, dmxBreak = 1): number {
	let last = 0;
	for (const ch of mode.channels) {
		if (ch.offset === null || (ch.dmxBreak ?? 1) !== dmxBreak) continue;
		let end = ch.offset + bytesOf(ch.bits) - 1;
		if (ch.fineOffsets !== undefined && ch.fineOffsets.length > 0) end = Math.max(ch.offset, ...ch.fineOffsets);
		if (end > last) last = end;
	}
	return dmxBreak === 1 ? Math.max(last, mode.slots ?? 0) : last;
}

/** Footprint per break, e.g. [{ dmxBreak: 1, slots: 24 }, { dmxBreak: 2, slots: 8 }]. */
export function breakFootprints(mode: Mode): { dmxBreak: number; slots: number }[] {
	return modeBreaks(mode).map((b) => ({ dmxBreak: b, slots: modeSlotCount(mode, b) }));
}

export interface ParameterSlots {
	parameter: string;
	bits: Bits;
	/** Slots in byte order (coarse first); empty for a virtual channel or a missing map entry. */
	slots: number[];
	/** The break the slots are on (its universe is the control's break entry); absent for break 1. */
	dmxBreak?: number;
}

/** Start address of a break of a DMX control: break 1 is `address`, others come from `breaks`. */
export function startOf(control: DmxControl, dmxBreak: number): number | undefined {
	if (dmxBreak === 1) return control.address;
	return control.breaks?.find((b) => b.dmxBreak === dmxBreak)?.address;
}

/** Which slots each parameter uses — for the universe map's "hover names the slot". */
export function parameterSlots(control: DmxControl | DmxMapControl, mode: Mode): ParameterSlots[] {
	const out: ParameterSlots[] = [];
	for (const ch of mode.channels) {
		const slots: number[] = [];
		if (ch.offset !== null && control.kind === 'dmx') {
			const start = startOf(control, breakOf(ch));
			if (start !== undefined) for (const o of channelOffsets(ch)) slots.push(start + o - 1);
		} else if (ch.offset !== null && control.kind === 'dmx-map') {
			const first = own(control.addresses, ch.parameter);
			if (first !== undefined) for (let i = 0; i < bytesOf(ch.bits); i++) slots.push(first + i);
		}
		const brk = breakOf(ch);
		out.push(
			brk === 1
				? { parameter: ch.parameter, bits: ch.bits, slots }
				: { parameter: ch.parameter, bits: ch.bits, slots, dmxBreak: brk }
		);
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
	/** Read-only: the empty list is shared. */
	problems: readonly FootprintProblem[];
}

/** Own-property lookup: parameter names are free text, so "constructor" must not hit the prototype. */
export function own<T>(rec: Readonly<Record<string, T>>, key: string): T | undefined {
	return Object.prototype.hasOwnProperty.call(rec, key) ? rec[key] : undefined;
}

function isAddress(a: number): boolean {
	return Number.isInteger(a) && a >= 1 && a <= UNIVERSE_SLOTS;
}

// Shared by every fixture without a problem, so the common case allocates nothing for it.
const NO_PROBLEMS: FootprintProblem[] = [];

/** Contiguous footprint from the start address. */
export function resolveDmx(address: number, slotCount: number): ResolvedFootprint {
	if (!isAddress(address)) return { runs: [], problems: [{ kind: 'out-of-range', address }] };
	if (slotCount === 0) return { runs: [], problems: NO_PROBLEMS };
	const last = address + slotCount - 1;
	if (last > UNIVERSE_SLOTS) {
		return {
			runs: [{ start: address, end: UNIVERSE_SLOTS }],
			problems: [{ kind: 'overflow', address, needs: slotCount, lastSlot: last }]
		};
	}
	return { runs: [{ start: address, end: last }], problems: NO_PROBLEMS };
}

/** What the slot rules need from a mode, worked out once per mode rather than once per fixture. */
export interface CompiledMode {
	/** Footprint of break 1. */
	slotCount: number;
	/** Footprints of breaks 2…n; empty for a one-break mode. */
	moreBreaks: { dmxBreak: number; slots: number }[];
	/** Parameters with a slot, first channel of each name only, in channel order. */
	mapped: { parameter: string; bytes: number }[];
}

export function compileMode(mode: Mode): CompiledMode {
	const mapped: CompiledMode['mapped'] = [];
	const seen = new Set<string>();
	for (const ch of mode.channels) {
		if (ch.offset === null || seen.has(ch.parameter)) continue;
		seen.add(ch.parameter);
		mapped.push({ parameter: ch.parameter, bytes: bytesOf(ch.bits) });
	}
	const moreBreaks = breakFootprints(mode).filter((b) => b.dmxBreak !== 1);
	return { slotCount: modeSlotCount(mode), moreBreaks, mapped };
}

/** Union of each parameter's slots; a 16-bit parameter at a takes a and a + 1. */
export function resolveDmxMap(
	addresses: Readonly<Record<string, number>>,
	mode: Mode | CompiledMode
): ResolvedFootprint {
	const compiled = 'mapped' in mode ? mode : compileMode(mode);
	let problems: FootprintProblem[] = NO_PROBLEMS;
	const slots: number[] = [];
	for (const { parameter, bytes } of compiled.mapped) {
		const a = own(addresses, parameter);
		if (a === undefined || !isAddress(a)) {
			if (problems === NO_PROBLEMS) problems = [];
			problems.push({ kind: 'out-of-range', parameter, address: a ?? null });
			continue;
		}
		const last = a + bytes - 1;
		if (last > UNIVERSE_SLOTS) {
			if (problems === NO_PROBLEMS) problems = [];
			problems.push({ kind: 'overflow', parameter, address: a, needs: bytes, lastSlot: last });
		}
		for (let s = a; s <= Math.min(last, UNIVERSE_SLOTS); s++) slots.push(s);
	}
	// Insertion sort: a mode has a handful of slots, and this runs once per fixture.
	for (let i = 1; i < slots.length; i++) {
		const v = slots[i];
		let j = i - 1;
		while (j >= 0 && slots[j] > v) {
			slots[j + 1] = slots[j];
			j--;
		}
		slots[j + 1] = v;
	}
	const runs: SlotRange[] = [];
	let doubled: number[] | undefined;
	for (const s of slots) {
		const run = runs[runs.length - 1];
		if (run !== undefined && s <= run.end) {
			doubled ??= [];
			if (doubled[doubled.length - 1] !== s) doubled.push(s);
		} else if (run !== undefined && s === run.end + 1) run.end = s;
		else runs.push({ start: s, end: s });
	}
	if (doubled !== undefined) {
		const doubledSet = new Set(doubled);
		const names = compiled.mapped
			.filter(({ parameter, bytes }) => {
				const a = own(addresses, parameter);
				if (a === undefined) return false;
				for (let s = a; s < a + bytes; s++) if (doubledSet.has(s)) return true;
				return false;
			})
			.map((p) => p.parameter);
		if (problems === NO_PROBLEMS) problems = [];
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

/** "6 slots", or per break for a mode over several DMX breaks: "6 + 4 slots (breaks 1 and 2)". */
export function footprintText(mode: {
	slots: number;
	breaks?: readonly { dmxBreak: number; slots: number }[];
}): string {
	const plural = (n: number) => `${n} ${n === 1 ? 'slot' : 'slots'}`;
	const bs = mode.breaks ?? [];
	if (bs.length < 2) return plural(mode.slots);
	const names = bs.map((b) => b.dmxBreak);
	return `${bs.map((b) => b.slots).join(' + ')} slots (breaks ${names.slice(0, -1).join(', ')} and ${names[names.length - 1]})`;
}
