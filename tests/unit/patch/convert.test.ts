import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	dmxToPercent,
	dmxToPhysical,
	inPhysicalRange,
	physicalRangeText,
	joinCoarseFine,
	joinValue,
	percentToDmx,
	physicalToDmx,
	rcMicrosToPercent,
	rcMicrosToRaw,
	rcPercentToRaw,
	rcRawToMicros,
	rcRawToPercent,
	splitCoarseFine,
	splitValue
} from '../../../src/lib/patch';

describe('percent ↔ DMX (our stated rounding: round half up of pct / 100 × max)', () => {
	it('maps 0, 50 and 100 % at 8 and 16 bit', () => {
		expect([0, 50, 100].map((p) => percentToDmx(p, 8))).toEqual([0, 128, 255]); // 127.5 rounds up
		expect([0, 50, 100].map((p) => percentToDmx(p, 16))).toEqual([0, 32768, 65535]); // 32767.5 rounds up
		expect(percentToDmx(150)).toBe(255);
		expect(percentToDmx(-5)).toBe(0);
		expect(dmxToPercent(255)).toBe(100);
		expect(dmxToPercent(0, 16)).toBe(0);
	});

	it('round-trips every 8-bit value through percent', () => {
		for (let v = 0; v <= 255; v++) expect(percentToDmx(dmxToPercent(v))).toBe(v);
	});
});

describe('coarse / fine (DESIGN.md: coarse = v >> 8, fine = v & 255)', () => {
	it('splits 0xFFFF into 255/255 and 32768 into 128/0', () => {
		expect(splitCoarseFine(0xffff)).toEqual({ coarse: 255, fine: 255 });
		expect(splitCoarseFine(32768)).toEqual({ coarse: 128, fine: 0 });
		expect(joinCoarseFine(128, 0)).toBe(32768);
	});

	it('splits and joins 24-bit values coarse first', () => {
		expect(splitValue(0x123456, 24)).toEqual([0x12, 0x34, 0x56]);
		expect(joinValue([0x12, 0x34, 0x56])).toBe(0x123456);
		expect(() => splitValue(256, 8)).toThrow(RangeError);
	});

	it('property: split then join is the identity and matches the shift definition', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 0xffff }), (v) => {
				expect(splitValue(v, 16)).toEqual([v >> 8, v & 255]);
				expect(joinValue(splitValue(v, 16))).toBe(v);
			})
		);
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 0xffffff }), (v) => {
				expect(joinValue(splitValue(v, 24))).toBe(v);
			})
		);
	});
});

describe('physical value ↔ DMX through a channel range (linear, clamped)', () => {
	const cct = { min: 2000, max: 10000 };
	it('maps kelvin and degrees onto the DMX range', () => {
		expect(physicalToDmx(2000, cct)).toBe(0);
		expect(physicalToDmx(10000, cct)).toBe(255);
		expect(physicalToDmx(6000, cct, 16)).toBe(32768);
		expect(physicalToDmx(1000, cct)).toBe(0);
		expect(physicalToDmx(12000, cct)).toBe(255);
		expect(physicalToDmx(180, { min: 0, max: 360 })).toBe(128);
		expect(dmxToPhysical(255, { min: 0, max: 360 })).toBe(360);
		expect(dmxToPhysical(0, cct, 16)).toBe(2000);
	});

	// DIN SPEC 15800 channel function: PhysicalFrom is at the function's DMXFrom and PhysicalTo at its
	// last value, one below the next function's DMXFrom; the direction is kept (the CTC example).
	it("maps through the channel function's sub-range: CTC 10000 → 2000 K over DMX 0–199", () => {
		const ctc = { min: 10000, max: 2000, dmxFrom: 0, dmxTo: 199 };
		expect(physicalToDmx(10000, ctc)).toBe(0);
		expect(physicalToDmx(2000, ctc)).toBe(199);
		// 6000 K is halfway: 99.5 rounds half up to 100
		expect(physicalToDmx(6000, ctc)).toBe(100);
		expect(physicalToDmx(1000, ctc)).toBe(199);
		expect(dmxToPhysical(0, ctc)).toBe(10000);
		expect(dmxToPhysical(199, ctc)).toBe(2000);
		expect(dmxToPhysical(100, ctc)).toBeCloseTo(10000 - (100 / 199) * 8000, 9);
		// 200–255 belongs to the next channel function: no kelvin there, and the value is clamped
		expect(dmxToPhysical(230, ctc)).toBe(2000);
		expect([0, 199, 200].map((v) => inPhysicalRange(v, ctc))).toEqual([true, true, false]);
		expect(physicalRangeText({ ...ctc, unit: 'K' })).toBe('10000 → 2000 K at DMX 0–199');
		expect(physicalRangeText({ min: 0, max: 360, unit: '°' })).toBe('0 → 360 °');
	});

	it('a sub-range starting above 0 at 16 bits: hue 0 → 360 ° over 1000–60999', () => {
		const hue = { min: 0, max: 360, dmxFrom: 1000, dmxTo: 60999 };
		expect(physicalToDmx(0, hue, 16)).toBe(1000);
		expect(physicalToDmx(360, hue, 16)).toBe(60999);
		expect(physicalToDmx(180, hue, 16)).toBe(31000);
		expect(dmxToPhysical(31000, hue, 16)).toBeCloseTo((30000 / 59999) * 360, 9);
		expect(dmxToPhysical(500, hue, 16)).toBe(0);
	});

	it('round-trips every DMX value of a sub-range to itself', () => {
		const ctc = { min: 10000, max: 2000, dmxFrom: 0, dmxTo: 199 };
		for (let v = 0; v <= 199; v++) expect(physicalToDmx(dmxToPhysical(v, ctc), ctc)).toBe(v);
	});
});

// SBUS / CRSF: 172–1811 raw, centre 992; µs = (raw − 992) × 5/8 + 1500 (common practice of the
// open flight-controller firmware, not a published standard).
describe('SBUS / CRSF raw ↔ µs ↔ percent', () => {
	it('maps 172 / 992 / 1811 to 988 / 1500 / 2012 µs and back', () => {
		expect([172, 992, 1811].map((r) => Math.round(rcRawToMicros(r)))).toEqual([988, 1500, 2012]);
		expect(rcRawToMicros(992)).toBe(1500);
		expect([988, 1500, 2012].map(rcMicrosToRaw)).toEqual([172, 992, 1811]);
	});

	it('maps 172 to 0 % and 1811 to 100 %', () => {
		expect([rcRawToPercent(172), rcRawToPercent(1811), rcRawToPercent(100)]).toEqual([0, 100, 0]);
		expect([rcPercentToRaw(0), rcPercentToRaw(50), rcPercentToRaw(100)]).toEqual([172, 992, 1811]);
		expect(rcMicrosToPercent(1500)).toBeCloseTo(50, 1);
	});

	it('property: µs → raw picks a raw value whose pulse width rounds back to the same µs', () => {
		fc.assert(
			fc.property(fc.integer({ min: 988, max: 2012 }), (us) => {
				const raw = rcMicrosToRaw(us);
				expect(Math.floor(rcRawToMicros(raw) + 0.5)).toBe(us);
				expect(Math.floor(rcRawToMicros(raw - 1) + 0.5)).toBeLessThan(us);
			})
		);
	});
});
