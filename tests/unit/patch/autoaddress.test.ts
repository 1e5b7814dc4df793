import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	autoAddress,
	autoAddressAcross,
	autoAddressBreaks,
	type AutoAddressFixture,
	type BreakFixture
} from '../../../src/lib/patch';

const fx = (id: number, slots: number, number = id): AutoAddressFixture => ({ id, number, slots });

describe('autoAddress — DESIGN.md auto-address rules (E1.11: 512 slots, no wrap)', () => {
	it('places first fit in fixture-number order around what is patched', () => {
		const r = autoAddress({
			fixtures: [fx(3, 4, 30), fx(1, 8, 10), fx(2, 2, 20)],
			occupied: [
				{ start: 1, end: 4 },
				{ start: 9, end: 20 }
			],
			start: 1
		});
		// #10 (8 slots) skips the 4-slot hole at 5–8; #20 (2 slots) then takes it; #30 follows #10.
		expect(r).toEqual({
			placed: [
				{ fixtureId: 1, address: 21 },
				{ fixtureId: 2, address: 5 },
				{ fixtureId: 3, address: 29 }
			],
			unplaced: []
		});
	});

	it('never straddles 512 and says why a fixture did not fit', () => {
		const r = autoAddress({
			fixtures: [fx(1, 8), fx(2, 8), fx(3, 4)],
			occupied: [],
			start: 490,
			universeLabel: 'universe 3'
		});
		expect(r.placed).toEqual([
			{ fixtureId: 1, address: 490 },
			{ fixtureId: 2, address: 498 },
			{ fixtureId: 3, address: 506 }
		]);
		const full = autoAddress({ fixtures: [fx(1, 8), fx(2, 8), fx(3, 8)], start: 490, universeLabel: 'universe 3' });
		expect(full.unplaced).toEqual([{ fixtureId: 3, reason: 'needs 8 slots; no free run of 8 from 490 in universe 3' }]);
	});

	it('starts each fixture on 1, 11, 21 … for align 10 and 1, 101, 201 … for align 100', () => {
		const ten = autoAddress({ fixtures: [fx(1, 12), fx(2, 3), fx(3, 10)], align: 10 });
		expect(ten.placed.map((p) => p.address)).toEqual([1, 21, 31]);
		const hundred = autoAddress({ fixtures: [fx(1, 12), fx(2, 3)], align: 100, occupied: [{ start: 1, end: 1 }] });
		expect(hundred.placed.map((p) => p.address)).toEqual([101, 201]);
	});

	it('treats a list of numbers as a sparse set of occupied slots (a dmx-map fixture)', () => {
		const r = autoAddress({ fixtures: [fx(1, 2), fx(2, 1)], occupied: [[2, 5]] });
		expect(r.placed).toEqual([
			{ fixtureId: 1, address: 3 },
			{ fixtureId: 2, address: 1 }
		]);
	});

	it('leaves the gap free after each placed fixture', () => {
		const r = autoAddress({ fixtures: [fx(1, 4), fx(2, 4)], gap: 2 });
		expect(r.placed.map((p) => p.address)).toEqual([1, 7]);
	});

	it('reports what cannot be addressed at all', () => {
		const r = autoAddress({ fixtures: [fx(1, 0), fx(2, 600)] });
		expect(r.unplaced.map((u) => u.reason)).toEqual([
			'takes no DMX slots; nothing to address',
			'needs 600 slots; a universe has 512'
		]);
		expect(() => autoAddress({ fixtures: [], start: 0 })).toThrow(RangeError);
	});

	it('spills across universes in order', () => {
		const r = autoAddressAcross({
			fixtures: [fx(1, 300), fx(2, 300), fx(3, 200)],
			universes: [{ universeId: 7 }, { universeId: 8 }]
		});
		expect(r.placed).toEqual([
			{ fixtureId: 1, universeId: 7, address: 1 },
			{ fixtureId: 2, universeId: 8, address: 1 },
			{ fixtureId: 3, universeId: 7, address: 301 }
		]);
		const none = autoAddressAcross({
			fixtures: [fx(1, 300)],
			universes: [
				{ universeId: 7, occupied: [{ start: 100, end: 300 }] },
				{ universeId: 8, start: 300 }
			]
		});
		expect(none.unplaced).toEqual([
			{ fixtureId: 1, reason: 'needs 300 slots; no free run of 300 in any of the 2 universes' }
		]);
	});

	// speed is measured by `npm run bench` (autopatch-10k); tests never assert timings
	it('places 10,000 fixtures into empty universes, every one inside a universe and none overlapping', () => {
		const fixtures = Array.from({ length: 10_000 }, (_, i) => fx(i + 1, [1, 4, 7, 12, 16, 24][i % 6] as number));
		const universes = Array.from({ length: 260 }, (_, i) => ({ universeId: i + 1 }));
		const r = autoAddressAcross({ fixtures, universes });
		expect(r.unplaced).toEqual([]);
		expect(r.placed).toHaveLength(10_000);
		const size = new Map(fixtures.map((f) => [f.id, f.slots]));
		const taken = new Set<string>();
		for (const p of r.placed) {
			const end = p.address + size.get(p.fixtureId)! - 1;
			expect(end).toBeLessThanOrEqual(512);
			for (let s = p.address; s <= end; s++) {
				const key = `${p.universeId}.${s}`;
				expect(taken.has(key)).toBe(false);
				taken.add(key);
			}
		}
	});
});

// Oracle: the same first fit done slot by slot on a 512-entry array.
function bruteForce(
	fixtures: AutoAddressFixture[],
	occupied: number[],
	start: number,
	align: number,
	gap: number
): Map<number, number | null> {
	const taken = new Array<boolean>(514).fill(false);
	for (const s of occupied) taken[s] = true;
	const out = new Map<number, number | null>();
	for (const f of [...fixtures].sort((a, b) => a.number - b.number || a.id - b.id)) {
		let found: number | null = null;
		for (let a = start; f.slots > 0 && a + f.slots - 1 <= 512 && found === null; a++) {
			if ((a - 1) % align !== 0) continue;
			let free = true;
			for (let s = a; s < a + f.slots; s++) if (taken[s]) free = false;
			if (free) found = a;
		}
		if (found !== null) {
			for (let s = found; s < found + f.slots; s++) taken[s] = true;
			for (let s = found + f.slots; s < found + f.slots + gap && s <= 512 && !taken[s]; s++) taken[s] = true;
		}
		out.set(f.id, found);
	}
	return out;
}

describe('autoAddress — property: matches a slot-by-slot first fit, never overlaps or overflows', () => {
	const inputArb = fc.record({
		sizes: fc.array(fc.integer({ min: 1, max: 60 }), { maxLength: 40 }),
		numbers: fc.array(fc.integer({ min: 1, max: 1000 }), { minLength: 40, maxLength: 40 }),
		occupied: fc.array(fc.integer({ min: 1, max: 512 }), { maxLength: 200 }),
		start: fc.integer({ min: 1, max: 512 }),
		align: fc.constantFrom(1, 1, 2, 10, 100),
		gap: fc.constantFrom(0, 0, 1, 3)
	});

	it('places exactly what first fit places, within 1–512, clear of occupied and of each other', () => {
		fc.assert(
			fc.property(inputArb, ({ sizes, numbers, occupied, start, align, gap }) => {
				const fixtures = sizes.map((slots, i) => fx(i + 1, slots, numbers[i]));
				const r = autoAddress({ fixtures, occupied: [occupied], start, align, gap });
				const want = bruteForce(fixtures, occupied, start, align, gap);
				const got = new Map<number, number | null>(r.placed.map((p) => [p.fixtureId, p.address]));
				for (const u of r.unplaced) got.set(u.fixtureId, null);
				expect(got).toEqual(want);
				const used = new Set(occupied);
				for (const p of r.placed) {
					const slots = sizes[p.fixtureId - 1] as number;
					expect(p.address).toBeGreaterThanOrEqual(start);
					expect(p.address + slots - 1).toBeLessThanOrEqual(512);
					expect((p.address - 1) % align).toBe(0);
					for (let s = p.address; s < p.address + slots; s++) {
						expect(used.has(s)).toBe(false);
						used.add(s);
					}
				}
			}),
			{ numRuns: 300 }
		);
	});

	it('leaves a fixture unplaced only when no aligned free run of its size exists at its turn', () => {
		fc.assert(
			fc.property(inputArb, ({ sizes, occupied, start, align }) => {
				const fixtures = sizes.map((slots, i) => fx(i + 1, slots));
				const r = autoAddress({ fixtures, occupied: [occupied], start, align });
				const taken = new Set(occupied);
				const placedAt = new Map(r.placed.map((p) => [p.fixtureId, p.address]));
				for (const f of fixtures) {
					const at = placedAt.get(f.id);
					if (at !== undefined) {
						for (let s = at; s < at + f.slots; s++) taken.add(s);
						continue;
					}
					let fits = false;
					for (let a = start; a + f.slots - 1 <= 512; a++) {
						if ((a - 1) % align !== 0) continue;
						let free = true;
						for (let s = a; s < a + f.slots; s++) if (taken.has(s)) free = false;
						if (free) fits = true;
					}
					expect(fits).toBe(false);
				}
			}),
			{ numRuns: 300 }
		);
	});
});

// DIN SPEC 15800 DMX mode: a mode may span several DMX breaks; each break needs its own start address.
describe('autoAddressBreaks — a start address per DMX break', () => {
	const two = (id: number, slots: number, more: number, number = id): BreakFixture => ({
		id,
		number,
		slots,
		breaks: [{ dmxBreak: 2, slots: more }]
	});

	it('places one-break fixtures exactly as autoAddress does', () => {
		const fixtures = [fx(3, 4, 30), fx(1, 8, 10), fx(2, 2, 20)];
		const occupied = [
			{ start: 1, end: 4 },
			{ start: 9, end: 20 }
		];
		expect(autoAddressBreaks({ fixtures, universeId: 7, occupied: new Map([[7, occupied]]), align: 1 })).toEqual(
			autoAddress({ fixtures, occupied })
		);
	});

	it('lets break 2 follow on after break 1 in the same universe, round addresses included', () => {
		const r = autoAddressBreaks({ fixtures: [two(1, 6, 4), two(2, 6, 4)], universeId: 1 });
		expect(r).toEqual({
			placed: [
				{ fixtureId: 1, address: 1, breaks: [{ dmxBreak: 2, universeId: 1, address: 7 }] },
				{ fixtureId: 2, address: 11, breaks: [{ dmxBreak: 2, universeId: 1, address: 17 }] }
			],
			unplaced: []
		});
		const round = autoAddressBreaks({ fixtures: [two(1, 6, 4), two(2, 6, 4)], universeId: 1, align: 10 });
		expect(round.placed.map((p) => [p.address, p.breaks?.[0].address])).toEqual([
			[1, 11],
			[21, 31]
		]);
	});

	it('puts each break 2 on a universe of its own, filled from 1 around what is there', () => {
		const r = autoAddressBreaks({
			fixtures: [two(1, 6, 4), two(2, 6, 4)],
			universeId: 1,
			start: 101,
			breakUniverses: { 2: 2 },
			occupied: new Map([[2, [{ start: 1, end: 2 }]]])
		});
		expect(r.placed).toEqual([
			{ fixtureId: 1, address: 101, breaks: [{ dmxBreak: 2, universeId: 2, address: 3 }] },
			{ fixtureId: 2, address: 107, breaks: [{ dmxBreak: 2, universeId: 2, address: 7 }] }
		]);
	});

	it('places a fixture whole or not at all, and names the break that did not fit', () => {
		const r = autoAddressBreaks({
			fixtures: [two(1, 6, 500), fx(2, 6)],
			universeId: 1,
			breakUniverses: { 2: 2 },
			occupied: new Map([[2, [{ start: 1, end: 20 }]]]),
			labels: new Map([[2, 'universe 2']])
		});
		// fixture 1's break 1 is taken back, so fixture 2 gets address 1
		expect(r).toEqual({
			placed: [{ fixtureId: 2, address: 1 }],
			unplaced: [{ fixtureId: 1, reason: 'break 2 needs 500 slots; no free run of 500 from 1 in universe 2' }]
		});
	});
});
