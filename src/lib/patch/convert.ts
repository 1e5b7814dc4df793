import { bytesOf } from './footprint';
import type { Bits } from './types';

/** Highest DMX value at a bit depth: 255, 65535, 16777215. */
export function maxValue(bits: Bits): number {
	return 2 ** bits - 1;
}

function clamp(v: number, lo: number, hi: number): number {
	return v < lo ? lo : v > hi ? hi : v;
}

// Round half up, so 50 % of 255 (127.5) is 128: the rounding we state on every sheet.
function roundHalfUp(v: number): number {
	return Math.floor(v + 0.5);
}

/** Percent (clamped to 0–100) → DMX value: round half up of pct / 100 × max. */
export function percentToDmx(percent: number, bits: Bits = 8): number {
	return roundHalfUp((clamp(percent, 0, 100) / 100) * maxValue(bits));
}

export function dmxToPercent(value: number, bits: Bits = 8): number {
	return (clamp(value, 0, maxValue(bits)) / maxValue(bits)) * 100;
}

/** Value → bytes, coarse first (coarse = v >> 8, fine = v & 255 for 16-bit). */
export function splitValue(value: number, bits: Bits): number[] {
	if (!Number.isInteger(value) || value < 0 || value > maxValue(bits)) {
		throw new RangeError(`${value} is not a ${bits}-bit DMX value`);
	}
	const out: number[] = [];
	for (let i = bytesOf(bits) - 1; i >= 0; i--) out.push(Math.floor(value / 2 ** (8 * i)) & 255);
	return out;
}

/** Bytes, coarse first → value. */
export function joinValue(bytes: readonly number[]): number {
	let v = 0;
	for (const b of bytes) {
		if (!Number.isInteger(b) || b < 0 || b > 255) throw new RangeError(`${b} is not a DMX byte`);
		v = v * 256 + b;
	}
	return v;
}

export function splitCoarseFine(value: number): { coarse: number; fine: number } {
	const [coarse, fine] = splitValue(value, 16);
	return { coarse, fine };
}

export function joinCoarseFine(coarse: number, fine: number): number {
	return joinValue([coarse, fine]);
}

export interface PhysicalRange {
	/** Physical value at the first DMX value of the range; may exceed `max` (a range running downward). */
	min: number;
	/** Physical value at the last DMX value of the range. */
	max: number;
	/**
	 * DMX sub-range the physical range covers (DIN SPEC 15800 channel function: from its DMXFrom to one
	 * below the next function's DMXFrom); the whole channel when absent.
	 */
	dmxFrom?: number;
	dmxTo?: number;
}

function dmxSpan(range: PhysicalRange, bits: Bits): [number, number] {
	const top = maxValue(bits);
	const lo = clamp(range.dmxFrom ?? 0, 0, top);
	return [lo, clamp(range.dmxTo ?? top, lo, top)];
}

/**
 * Physical value (K, °) → DMX through a channel's range: linear from `min` at the sub-range's first
 * value to `max` at its last, clamped to the sub-range, round half up. A downward range (10000 → 2000 K)
 * maps the higher value to the lower DMX value.
 */
export function physicalToDmx(value: number, range: PhysicalRange, bits: Bits = 8): number {
	const [lo, hi] = dmxSpan(range, bits);
	const span = range.max - range.min;
	if (span === 0) return lo;
	const t = clamp((value - range.min) / span, 0, 1);
	return roundHalfUp(lo + t * (hi - lo));
}

/** DMX → physical value through a channel's range; a DMX value outside the sub-range is clamped to it. */
export function dmxToPhysical(value: number, range: PhysicalRange, bits: Bits = 8): number {
	const [lo, hi] = dmxSpan(range, bits);
	if (hi === lo) return range.min;
	return range.min + ((clamp(value, lo, hi) - lo) / (hi - lo)) * (range.max - range.min);
}

/** Whether a DMX value falls inside the range's sub-range (outside it the channel does something else). */
export function inPhysicalRange(value: number, range: PhysicalRange, bits: Bits = 8): boolean {
	const [lo, hi] = dmxSpan(range, bits);
	return value >= lo && value <= hi;
}

/** "10000 → 2000 K at DMX 0–199", "0 → 360 °" — a channel's range as a person reads it. */
export function physicalRangeText(range: PhysicalRange & { unit?: string }, bits: Bits = 8): string {
	const unit = range.unit ? ` ${range.unit}` : '';
	const text = `${range.min} → ${range.max}${unit}`;
	if (range.dmxFrom === undefined && range.dmxTo === undefined) return text;
	const [lo, hi] = dmxSpan(range, bits);
	return `${text} at DMX ${lo}–${hi}`;
}

// SBUS / CRSF 11-bit channel values: 172 = −100 %, 992 = centre, 1811 = +100 % (common practice
// of the open-source flight-controller and ELRS firmware, not a published standard).
export const RC_RAW_MIN = 172;
export const RC_RAW_CENTRE = 992;
export const RC_RAW_MAX = 1811;

/**
 * Raw → pulse width: µs = (raw − 992) × 5/8 + 1500, the widely used mapping (common practice),
 * which gives 172 → 987.5, 992 → 1500, 1811 → 2011.875 µs. Not rounded.
 */
export function rcRawToMicros(raw: number): number {
	return ((raw - RC_RAW_CENTRE) * 5) / 8 + 1500;
}

/**
 * Pulse width → the lowest raw value whose pulse width rounds (half up) to `micros` at 1 µs, so
 * 988 / 1500 / 2012 µs give 172 / 992 / 1811. Clamped to the 11-bit field.
 */
export function rcMicrosToRaw(micros: number): number {
	return clamp(Math.ceil(((micros - 1500) * 8 - 4) / 5) + RC_RAW_CENTRE, 0, 2047);
}

/** Raw → percent of travel, 172 = 0 %, 1811 = 100 % (clamped). */
export function rcRawToPercent(raw: number): number {
	return (clamp(raw - RC_RAW_MIN, 0, RC_RAW_MAX - RC_RAW_MIN) / (RC_RAW_MAX - RC_RAW_MIN)) * 100;
}

export function rcPercentToRaw(percent: number): number {
	return RC_RAW_MIN + roundHalfUp((clamp(percent, 0, 100) / 100) * (RC_RAW_MAX - RC_RAW_MIN));
}

export function rcMicrosToPercent(micros: number): number {
	return rcRawToPercent(rcMicrosToRaw(micros));
}

export function rcPercentToMicros(percent: number): number {
	return rcRawToMicros(rcPercentToRaw(percent));
}
