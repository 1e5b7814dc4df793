import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	airTravel,
	circuitCurrent,
	computePower,
	dayWindow,
	drawAt,
	packEnergy,
	packsShort,
	packVolts,
	runtimeMinutes,
	simulateRotation,
	type PowerFixtureInput
} from '../../../src/lib/patch';

const fixture = (over: Partial<PowerFixtureInput> & { id: number }): PowerFixtureInput => ({
	number: over.id,
	label: '',
	drawFullW: 100,
	drawFloor: 0.1,
	intensity: null,
	inputVolts: null,
	feed: { kind: 'none' },
	...over
});

describe('pack voltage and energy (cell voltages: common practice, from memory)', () => {
	it('150 W on a 6-cell Li-ion 4.5 Ah pack', () => {
		// nominal 6 × 3.6 V = 21.6 V; full 6 × 4.2 V = 25.2 V; end of discharge 6 × 3.0 V = 18.0 V
		expect(packVolts('li-ion', 6)).toEqual({ nominal: 21.6, full: 25.2, empty: 18 });
		// 4.5 Ah × 21.6 V = 97.2 Wh
		expect(packEnergy({ chemistry: 'li-ion', cells: 6, ampHours: 4.5, wattHours: null }).wattHours).toBe(97.2);
		// current at end of discharge: 150 W ÷ 18.0 V = 8.333 A
		const r = computePower({
			fixtures: [fixture({ id: 1, drawFullW: 150, feed: { kind: 'battery', packTypeId: 7 } })],
			packTypes: [
				{
					id: 7,
					name: 'six-cell',
					chemistry: 'li-ion',
					cells: 6,
					ampHours: 4.5,
					wattHours: null,
					maxCurrentA: 8,
					onHand: 40,
					chargeHours: null,
					chargers: 0,
					chargerBays: 0
				}
			],
			circuits: [],
			usableFraction: 0.85,
			dayStart: '08:00',
			dayWrap: '09:00'
		});
		const p = r.packTypes[0]!;
		expect(p.nominalVolts).toBe(21.6);
		expect(p.wattHours).toBe(97.2);
		expect(p.fixtures[0]!.currentA).toBeCloseTo(8.333, 3);
		// runtime: 97.2 Wh × 0.85 = 82.62 Wh usable; 82.62 ÷ 150 W = 0.5508 h = 33.05 min
		expect(p.fixtures[0]!.runtimeMin).toBeCloseTo(33.05, 1);
		expect(runtimeMinutes(97.2, 0.85, 150)).toBeCloseTo(33.048, 3);
		// 8.33 A is more than the pack's 8 A continuous
		expect(p.warnings.map((w) => w.code)).toEqual(['over-current']);
		// 97.2 Wh is under 100 Wh: flies in the cabin (IATA)
		expect(p.airTravel).toBe('ok');
	});

	it('LiPo and LiFePO4 cells (common practice, from memory)', () => {
		// 4 × 3.7 = 14.8 V; 4 × 3.2 = 12.8 V, 4 × 3.65 = 14.6 V, 4 × 2.5 = 10 V
		expect(packVolts('lipo', 4).nominal).toBe(14.8);
		expect(packVolts('lifepo4', 4)).toEqual({ nominal: 12.8, full: 14.6, empty: 10 });
		// Wh given: Ah = 98 Wh ÷ 14.4 V = 6.806 Ah
		expect(packEnergy({ chemistry: 'li-ion', cells: 4, ampHours: null, wattHours: 98 }).ampHours).toBeCloseTo(6.806, 3);
	});
});

describe('air travel (IATA lithium battery guidance: 100 Wh and 160 Wh)', () => {
	it('draws the lines at 100 and 160 Wh', () => {
		expect(airTravel(100)).toBe('ok');
		expect(airTravel(100.01)).toBe('approval');
		expect(airTravel(160)).toBe('approval');
		expect(airTravel(160.01)).toBe('forbidden');
		// 4-cell Li-ion: 14.4 V × 6.94 Ah = 99.94 Wh (ok); × 6.95 Ah = 100.08 Wh (approval)
		expect(airTravel(packEnergy({ chemistry: 'li-ion', cells: 4, ampHours: 6.94, wattHours: null }).wattHours)).toBe(
			'ok'
		);
		expect(airTravel(packEnergy({ chemistry: 'li-ion', cells: 4, ampHours: 6.95, wattHours: null }).wattHours)).toBe(
			'approval'
		);
	});
});

describe('draw at the planned look (common practice: linear for LED engines, with a floor)', () => {
	it('scales between the floor and full', () => {
		// 85 W × (0.2 + 0.8 × 0.5) = 85 × 0.6 = 51 W
		expect(drawAt(85, 50, 0.2)).toBeCloseTo(51, 9);
		expect(drawAt(85, 0, 0.2)).toBeCloseTo(17, 9);
		expect(drawAt(85, 100, 0.2)).toBe(85);
		expect(drawAt(85, null, 0.2)).toBe(85);
	});

	it('never leaves [floor × full, full]', () => {
		fc.assert(
			fc.property(
				fc.double({ min: 0, max: 5000, noNaN: true }),
				fc.double({ min: 0, max: 100, noNaN: true }),
				fc.double({ min: 0, max: 1, noNaN: true }),
				(w, i, f) => {
					const d = drawAt(w, i, f);
					expect(d).toBeLessThanOrEqual(w + 1e-9);
					expect(d).toBeGreaterThanOrEqual(w * f - 1e-9);
				}
			)
		);
	});
});

describe('circuits (NEC 210.19(A)/210.20(A) practice: continuous load within 80 %; local codes differ)', () => {
	const run = (volts: number, breakerA: number, watts: number[]) =>
		computePower({
			fixtures: watts.map((w, k) => fixture({ id: k + 1, drawFullW: w, feed: { kind: 'mains', circuitId: 1 } })),
			packTypes: [],
			circuits: [{ id: 1, name: 'c', volts, breakerA, powerFactor: 0.9 }],
			usableFraction: 0.85,
			dayStart: '08:00',
			dayWrap: '18:00'
		}).circuits[0]!;

	it('120 V, 20 A breaker, PF 0.9', () => {
		// 80 % of 20 A = 16 A = 16 × 120 × 0.9 = 1728 W: exactly at the line, no warning
		expect(circuitCurrent(1728, 120, 0.9)).toBeCloseTo(16, 9);
		expect(run(120, 20, [864, 864]).warnings).toEqual([]);
		// 1800 W ÷ (120 × 0.9) = 16.67 A = 83.3 %
		const c = run(120, 20, [900, 900]);
		expect(c.currentA).toBeCloseTo(16.67, 2);
		expect(c.percentOfBreaker).toBeCloseTo(83.3, 1);
		expect(c.warnings.map((w) => w.code)).toEqual(['circuit-over-80']);
		// 2200 W ÷ 108 = 20.37 A: over the breaker
		expect(run(120, 20, [2200]).warnings.map((w) => w.code)).toEqual(['circuit-over-100']);
	});

	it('230 V, 16 A breaker, PF 0.9', () => {
		// 80 % of 16 A = 12.8 A = 12.8 × 230 × 0.9 = 2649.6 W
		// 2600 W ÷ 207 = 12.56 A = 78.5 %: fine; 2700 W ÷ 207 = 13.04 A = 81.5 %: over 80 %
		expect(run(230, 16, [2600]).warnings).toEqual([]);
		const c = run(230, 16, [1350, 1350]);
		expect(c.percentOfBreaker).toBeCloseTo(81.5, 1);
		expect(c.warnings.map((w) => w.code)).toEqual(['circuit-over-80']);
		expect(c.fixtureIds).toEqual([1, 2]);
	});

	it('flags a fixture with no draw and leaves it out of the load', () => {
		const c = run(230, 16, [500]);
		expect(c.loadW).toBe(500);
		const r = computePower({
			fixtures: [fixture({ id: 1, drawFullW: null, feed: { kind: 'mains', circuitId: 1 } })],
			packTypes: [],
			circuits: [{ id: 1, name: 'c', volts: 230, breakerA: 16, powerFactor: 0.9 }],
			usableFraction: 0.85,
			dayStart: '08:00',
			dayWrap: '18:00'
		});
		expect(r.circuits[0]!.warnings.map((w) => w.code)).toEqual(['no-power-data']);
		expect(r.circuits[0]!.loadW).toBe(0);
	});
});

describe('voltage range', () => {
	it('flags a pack whose range leaves the fixture input range', () => {
		// 4-cell LiFePO4 runs 10.0–14.6 V; a fixture accepting 12–28 V browns out below 12 V
		const r = computePower({
			fixtures: [
				fixture({ id: 1, inputVolts: { min: 12, max: 28 }, feed: { kind: 'battery', packTypeId: 1 } }),
				fixture({ id: 2, inputVolts: { min: 9, max: 28 }, feed: { kind: 'battery', packTypeId: 1 } })
			],
			packTypes: [
				{
					id: 1,
					name: 'p',
					chemistry: 'lifepo4',
					cells: 4,
					ampHours: 6,
					wattHours: null,
					maxCurrentA: 20,
					onHand: 10,
					chargeHours: 2,
					chargers: 1,
					chargerBays: 2
				}
			],
			circuits: [],
			usableFraction: 0.85,
			dayStart: '08:00',
			dayWrap: '09:00'
		});
		expect(r.packTypes[0]!.warnings.map((w) => [w.code, w.fixtureId])).toEqual([['voltage-range', 1]]);
	});
});

describe('battery rotation for a shooting day', () => {
	it('fixture 12 goes dark at 16:40 unless one more pack is charged', () => {
		// draw at the look: 85 W × (0.2 + 0.8 × 0.5) = 51 W; 130 Wh × 0.85 = 110.5 Wh usable;
		// 110.5 Wh ÷ 51 W = 2.1667 h = 130 min. Day 08:00–18:00; swaps due 10:10, 12:20, 14:30, 16:40.
		// 3 packs on hand, one charger with one bay, 4 h a charge:
		// 08:00 pack 1 (2 left) · 10:10 pack 2, flat on charge until 14:10 (1 left) · 12:20 pack 3,
		// flat waits for the bay: 14:10–18:10 (0 left) · 14:10 one ready · 14:30 takes it (0 left),
		// flat queued 18:10–22:10 · 16:40 nothing charged: dark. A 4th pack covers 16:40–18:50.
		const input = (onHand: number) => ({
			fixtures: [
				fixture({
					id: 99,
					number: 12,
					drawFullW: 85,
					drawFloor: 0.2,
					intensity: 50,
					feed: { kind: 'battery' as const, packTypeId: 1 }
				})
			],
			packTypes: [
				{
					id: 1,
					name: 'p',
					chemistry: 'li-ion' as const,
					cells: 8,
					ampHours: null,
					wattHours: 130,
					maxCurrentA: 20,
					onHand,
					chargeHours: 4,
					chargers: 1,
					chargerBays: 1
				}
			],
			circuits: [],
			usableFraction: 0.85,
			dayStart: '08:00',
			dayWrap: '18:00'
		});
		const r = computePower(input(3));
		expect(r.packTypes[0]!.fixtures[0]!.runtimeMin).toBeCloseTo(130, 6);
		expect(r.day.shortfalls).toEqual([expect.objectContaining({ fixtureId: 99, darkAt: '16:40', packsShort: 1 })]);
		expect(r.day.shortfalls[0]!.message).toBe('Fixture 12 goes dark at 16:40 unless one more pack is charged.');
		// 130 Wh: above 100 Wh, airline approval (IATA)
		expect(r.packTypes[0]!.warnings.map((w) => w.code)).toEqual(['air-travel-approval']);
		expect(computePower(input(4)).day.shortfalls).toEqual([]);
	});

	it('a dark fixture lights again when a pack comes off charge', () => {
		// runtime 120 min, 2 packs, 2 bays, 3 h charge, 08:00–18:00:
		// 08:00 pack (1 left) · 10:00 swap, flat ready 13:00 (0 left) · 12:00 dark, flat ready 15:00 ·
		// 13:00 relit · 15:00 swap (the 15:00 pack), flat ready 18:00 · 17:00 dark to the wrap
		const sim = simulateRotation([{ id: 1, runtimeMin: 120 }], { onHand: 2, chargeHours: 3, slots: 2 }, 480, 1080);
		expect(sim.events.map((e) => [e.at, e.kind])).toEqual([
			[480, 'start'],
			[600, 'swap'],
			[720, 'dark'],
			[780, 'relit'],
			[900, 'swap'],
			[1020, 'dark']
		]);
		expect(sim.darkAt.get(1)).toBe(720);
		// 60 min + 60 min dark
		expect(sim.darkMinutes.get(1)).toBe(120);
		expect(packsShort([{ id: 1, runtimeMin: 120 }], { onHand: 2, chargeHours: 3, slots: 2 }, 480, 1080)).toBe(1);
	});

	it('a wrap before the start is the next morning', () => {
		expect(dayWindow('18:00', '06:00')).toEqual({ start: 1080, wrap: 1800 });
	});

	it('more packs on hand never makes a shortfall worse', () => {
		fc.assert(
			fc.property(
				fc.array(fc.integer({ min: 15, max: 400 }), { minLength: 1, maxLength: 6 }),
				fc.integer({ min: 0, max: 12 }),
				fc.option(fc.double({ min: 0.25, max: 8, noNaN: true })),
				fc.integer({ min: 0, max: 4 }),
				fc.integer({ min: 60, max: 900 }),
				(runtimes, onHand, chargeHours, slots, length) => {
					const fixtures = runtimes.map((runtimeMin, id) => ({ id, runtimeMin }));
					const pack = { onHand, chargeHours, slots };
					const more = { ...pack, onHand: onHand + 1 };
					const a = simulateRotation(fixtures, pack, 420, 420 + length);
					const b = simulateRotation(fixtures, more, 420, 420 + length);
					const first = (m: Map<number, number>) => (m.size ? Math.min(...m.values()) : Infinity);
					expect(first(b.darkAt)).toBeGreaterThanOrEqual(first(a.darkAt));
					expect(packsShort(fixtures, more, 420, 420 + length)).toBeLessThanOrEqual(
						packsShort(fixtures, pack, 420, 420 + length)
					);
				}
			)
		);
	});
});
