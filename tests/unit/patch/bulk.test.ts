import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitRun, formatLabel, renumberPlan } from '../../../src/lib/patch';

describe('formatLabel — the bulk tools’ label pattern', () => {
	it('puts the fixture number for {n} and the place in the batch for {i}', () => {
		expect(formatLabel('DECK {n}', { n: 101, i: 1 })).toBe('DECK 101');
		expect(formatLabel('{i}/{n}', { n: 7, i: 3 })).toBe('3/7');
	});
	it('pads {n:03} with zeros, never cuts a longer number', () => {
		expect(formatLabel('CAR {n:03}', { n: 7, i: 1 })).toBe('CAR 007');
		expect(formatLabel('CAR {i:02}', { n: 7, i: 12 })).toBe('CAR 12');
		expect(formatLabel('{n:2}', { n: 1234, i: 1 })).toBe('1234');
	});
	it('leaves text without a token (and unknown braces) as written', () => {
		expect(formatLabel('KEY', { n: 5, i: 1 })).toBe('KEY');
		expect(formatLabel('{x} {n', { n: 5, i: 1 })).toBe('{x} {n');
	});
});

describe('fitRun — a run laid end to end never passes slot 512 (ANSI E1.11)', () => {
	it('"3 of 6 slots from 505": only one fits; all three fit from 495', () => {
		// 505…512 holds 8 slots: one 6-slot footprint. 3 × 6 = 18 slots → latest start 512 − 18 + 1 = 495.
		const r = fitRun(3, 6, 505);
		expect(r.fits).toBe(1);
		expect(r.latestStart).toBe(495);
		expect(r.message).toBe(
			'Only 1 of 3 fixtures of 6 slots each fits from 505 in a 512-slot universe; start at 495 or lower, or add 1.'
		);
	});
	it('a run that exactly reaches 512 fits', () => {
		expect(fitRun(4, 8, 481)).toEqual({ fits: 4, latestStart: 481, message: null });
	});
	it('more than one universe holds says how many one universe takes', () => {
		// 512 / 8 = 64 fixtures of 8 slots in one universe
		const r = fitRun(70, 8, 1);
		expect(r.fits).toBe(64);
		expect(r.latestStart).toBeNull();
		expect(r.message).toContain('at most 64 fit in one universe');
	});
	it('property: the placed part of the run always ends at or before 512 and one more would not', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 1, max: 600 }),
				fc.integer({ min: 1, max: 64 }),
				fc.integer({ min: 1, max: 512 }),
				(count, slots, address) => {
					const r = fitRun(count, slots, address);
					const lastSlot = address + r.fits * slots - 1;
					expect(r.fits === 0 || lastSlot <= 512).toBe(true);
					if (r.fits < count) expect(address + (r.fits + 1) * slots - 1).toBeGreaterThan(512);
					expect(r.message === null).toBe(r.fits === count);
				}
			)
		);
	});
});

describe('renumberPlan', () => {
	it('keeps the selection in number order from the first number, in steps', () => {
		expect(
			renumberPlan(
				[
					{ id: 9, number: 30 },
					{ id: 4, number: 10 },
					{ id: 5, number: 20 }
				],
				101,
				10
			)
		).toEqual([
			{ id: 4, number: 101 },
			{ id: 5, number: 111 },
			{ id: 9, number: 121 }
		]);
	});
});
