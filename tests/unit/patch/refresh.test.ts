import { describe, expect, it } from 'vitest';
import { dmxFrameTiming, refreshFigures } from '../../../src/lib/patch';

// ANSI E1.11: 250 kbit/s (44 µs a slot), break ≥ 92 µs, MAB ≥ 12 µs.
describe('DMX512 refresh', () => {
	it('gives a full 512-slot universe ≈ 22.7 ms, ≈ 44 Hz at minimum break and MAB', () => {
		const t = dmxFrameTiming(512);
		expect(t.frameUs).toBe(92 + 12 + 513 * 44);
		expect(t.frameUs / 1000).toBeCloseTo(22.7, 1);
		expect(Math.round(t.rateHz)).toBe(44);
	});

	it('counts the start code as a slot and honours a longer break', () => {
		expect(dmxFrameTiming(100).frameUs).toBe(104 + 101 * 44);
		expect(dmxFrameTiming(100, { breakUs: 176, mabUs: 20 }).frameUs).toBe(196 + 101 * 44);
		expect(dmxFrameTiming(100, { breakUs: 50 }).frameUs).toBe(104 + 101 * 44);
	});

	it('pads very short frames to the 1204 µs minimum break-to-break (E1.11, value from memory)', () => {
		expect(dmxFrameTiming(10).frameUs).toBe(1204);
		expect(dmxFrameTiming(0).frameUs).toBe(1204);
		expect(dmxFrameTiming(25).frameUs).toBe(104 + 26 * 44);
		expect(() => dmxFrameTiming(513)).toThrow(RangeError);
	});
});

describe('refresh shown as both figures (ANSI E1.11 timing)', () => {
	it('24 slots: up to 830 Hz (1204 µs frame) if the transmitter stops there; 44 Hz at 512 (22 676 µs)', () => {
		const f = refreshFigures(24);
		// 92 + 12 + 25 × 44 = 1204 µs → 830.6 Hz; 92 + 12 + 513 × 44 = 22 676 µs → 44.1 Hz
		expect(f.bestHz).toBeCloseTo(1e6 / 1204, 6);
		expect(f.fullHz).toBeCloseTo(1e6 / 22676, 6);
		expect(f.text).toBe('up to 830 Hz if the transmitter sends 24 slots; 44 Hz at 512');
	});
	it('a full universe has one figure', () => {
		expect(refreshFigures(512).text).toBe('44 Hz at 512 slots');
		// an empty universe promised 830 Hz 'if the transmitter sends 0 slots' before
		expect(refreshFigures(0).text).toBe('nothing patched yet; 44 Hz at 512');
	});
});
