import { describe, expect, it } from 'vitest';
import {
	bytesOf,
	compactSlots,
	expandRanges,
	formatSlots,
	footprintText,
	modeSlotCount,
	parameterSlots,
	resolveDmx,
	resolveDmxMap
} from '../../../src/lib/patch';
import { channel, plainMode } from './factories';

// Footprint rules are DESIGN.md "Domain model"; 512 slots a universe is ANSI E1.11.
describe('footprint', () => {
	it('8-bit takes 1 slot, 16-bit coarse + fine 2, 24-bit 3', () => {
		expect([bytesOf(8), bytesOf(16), bytesOf(24)]).toEqual([1, 2, 3]);
	});

	it('counts a 16-bit mode with a gap up to its highest channel’s last slot', () => {
		// intensity 16-bit at 1–2, slots 3–4 unused, hue 16-bit at 5–6, strobe at 8
		const mode = {
			id: 1,
			name: 'gap',
			channels: [channel(1, 'intensity', 16), channel(5, 'hue', 16), channel(8, 'strobe')]
		};
		expect(modeSlotCount(mode)).toBe(8);
	});

	it('gives a virtual channel (offset null) no slot', () => {
		const mode = { id: 1, name: 'v', channels: [channel(1, 'intensity'), channel(null, 'fan'), channel(2, 'cct', 16)] };
		expect(modeSlotCount(mode)).toBe(3);
		expect(parameterSlots({ kind: 'dmx', universeId: 1, address: 10 }, mode)).toEqual([
			{ parameter: 'intensity', bits: 8, slots: [10] },
			{ parameter: 'fan', bits: 8, slots: [] },
			{ parameter: 'cct', bits: 16, slots: [11, 12] }
		]);
	});

	it('uses highest channel, not channel order, and a stored slot count only extends it', () => {
		const mode = { id: 1, name: 'r', channels: [channel(6, 'b', 24), channel(1, 'a')], slots: 4 };
		expect(modeSlotCount(mode)).toBe(8);
		expect(modeSlotCount({ ...mode, slots: 12 })).toBe(12);
		expect(modeSlotCount({ id: 2, name: 'empty', channels: [channel(null, 'x')] })).toBe(0);
	});

	it('fits 8 slots exactly at 505–512 but overflows at 506; 4 slots fit at 509', () => {
		expect(resolveDmx(505, 8)).toEqual({ runs: [{ start: 505, end: 512 }], problems: [] });
		expect(resolveDmx(506, 8).problems).toEqual([{ kind: 'overflow', address: 506, needs: 8, lastSlot: 513 }]);
		expect(resolveDmx(506, 8).runs).toEqual([{ start: 506, end: 512 }]);
		expect(resolveDmx(509, 4).problems).toEqual([]);
	});

	it('puts addresses 0 and 513 out of range', () => {
		expect(resolveDmx(0, 1).problems).toEqual([{ kind: 'out-of-range', address: 0 }]);
		expect(resolveDmx(513, 1).problems).toEqual([{ kind: 'out-of-range', address: 513 }]);
		expect(resolveDmx(1.5, 1).problems[0]?.kind).toBe('out-of-range');
		expect(resolveDmx(512, 1)).toEqual({ runs: [{ start: 512, end: 512 }], problems: [] });
	});

	it('takes a dmx-map fixture’s slots as the union per parameter, in maximal runs', () => {
		const mode = {
			id: 1,
			name: 'm',
			channels: [channel(1, 'intensity', 16), channel(3, 'hue'), channel(4, 'sat'), channel(null, 'v')]
		};
		const r = resolveDmxMap({ intensity: 100, hue: 7, sat: 102 }, mode);
		expect(r.problems).toEqual([]);
		expect(r.runs).toEqual([
			{ start: 7, end: 7 },
			{ start: 100, end: 102 }
		]);
		expect(expandRanges(r.runs)).toEqual([7, 100, 101, 102]);
	});

	it('reports dmx-map parameters missing, out of range, overflowing or doubled', () => {
		const mode = {
			id: 1,
			name: 'm',
			channels: [channel(1, 'a', 16), channel(3, 'b'), channel(4, 'c'), channel(5, 'd', 16)]
		};
		const r = resolveDmxMap({ a: 512, c: 0, d: 20, constructor: 5 }, mode);
		expect(r.problems).toEqual([
			{ kind: 'overflow', parameter: 'a', address: 512, needs: 2, lastSlot: 513 },
			{ kind: 'out-of-range', parameter: 'b', address: null },
			{ kind: 'out-of-range', parameter: 'c', address: 0 }
		]);
		expect(r.runs).toEqual([
			{ start: 20, end: 21 },
			{ start: 512, end: 512 }
		]);
		const doubled = resolveDmxMap({ a: 10, b: 11, c: 30, d: 31 }, mode);
		expect(doubled.problems).toEqual([{ kind: 'self-overlap', slots: [11], parameters: ['a', 'b'] }]);
	});

	it('formats slot lists as a person reads them', () => {
		expect(formatSlots([8, 5, 6, 7, 10])).toBe('5–8, 10');
		expect(compactSlots([3, 1, 2, 2])).toEqual([{ start: 1, end: 3 }]);
		expect(modeSlotCount(plainMode(1, 12))).toBe(12);
	});
});

describe('footprintText — how a person reads a footprint', () => {
	it('says slots once for one break and per break for several (DIN SPEC 15800 DMX mode breaks)', () => {
		expect(footprintText({ slots: 1 })).toBe('1 slot');
		expect(footprintText({ slots: 6, breaks: [{ dmxBreak: 1, slots: 6 }] })).toBe('6 slots');
		expect(
			footprintText({
				slots: 6,
				breaks: [
					{ dmxBreak: 1, slots: 6 },
					{ dmxBreak: 2, slots: 4 }
				]
			})
		).toBe('6 + 4 slots (breaks 1 and 2)');
	});
});
