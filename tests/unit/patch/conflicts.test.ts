import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	analysePatch,
	findConflicts,
	sweep,
	type Bits,
	type Conflict,
	type Mode,
	type PatchFixture,
	type PatchInput,
	type Receiver,
	type Universe
} from '../../../src/lib/patch';
import { channel, dmx, fixture, plainMode, universe } from './factories';

const kinds = (cs: Conflict[]): string[] => cs.map((c) => c.kind);

describe('conflicts — DESIGN.md rules', () => {
	const u3 = universe(30, 3);
	const modes = [plainMode(1, 4), plainMode(2, 8)];

	it('names exactly the shared slots of an overlap, once per pair', () => {
		const a = dmx(30, 5, { id: 12, number: 12 });
		const b = dmx(30, 7, { id: 14, number: 14, modeId: 2 });
		const cs = findConflicts({ universes: [u3], modes, fixtures: [b, a] });
		expect(cs).toEqual([
			{
				kind: 'overlap',
				severity: 'error',
				universeId: 30,
				slots: [7, 8],
				fixtureIds: [12, 14],
				message: 'Fixtures 12 and 14 both claim slots 7–8 of universe 3 — move one.'
			}
		]);
	});

	it('finds overlaps between sparse dmx-map fixtures slot by slot', () => {
		const sparse: Mode = {
			id: 3,
			name: 'map',
			channels: [channel(1, 'intensity', 16), channel(3, 'hue'), channel(4, 'cct', 16)]
		};
		const a = fixture(
			{ kind: 'dmx-map', universeId: 30, addresses: { intensity: 10, hue: 40, cct: 100 } },
			{ id: 1, number: 1, modeId: 3 }
		);
		const b = fixture(
			{ kind: 'dmx-map', universeId: 30, addresses: { intensity: 11, hue: 101, cct: 200 } },
			{ id: 2, number: 2, modeId: 3 }
		);
		const cs = findConflicts({ universes: [u3], modes: [sparse], fixtures: [a, b] });
		expect(cs.map((c) => [c.kind, c.slots, c.fixtureIds])).toEqual([['overlap', [11, 101], [1, 2]]]);
	});

	it('warns about a shared start in one mode without a link group, and does not also call it an overlap', () => {
		const a = dmx(30, 1, { id: 1, number: 1 });
		const b = dmx(30, 1, { id: 2, number: 2, linkGroup: 'A' });
		const c = dmx(30, 3, { id: 3, number: 3 });
		const cs = findConflicts({ universes: [u3], modes, fixtures: [a, b, c] });
		expect(cs.map((x) => [x.kind, x.severity, x.fixtureIds, x.slots])).toEqual([
			['overlap', 'error', [1, 3], [3, 4]],
			['overlap', 'error', [2, 3], [3, 4]],
			['shared', 'warning', [1, 2], [1]]
		]);
	});

	it('calls a stack all in one declared link group linked (info)', () => {
		const fs = [1, 2, 3].map((n) => dmx(30, 9, { id: n, number: n, linkGroup: 'dock' }));
		const cs = findConflicts({ universes: [u3], modes, fixtures: fs });
		expect(cs).toEqual([
			{
				kind: 'linked',
				severity: 'info',
				universeId: 30,
				slots: [9],
				fixtureIds: [1, 2, 3],
				message: 'Fixtures 1, 2 and 3 are linked (group "dock") on universe 3 address 9.'
			}
		]);
	});

	it('does not stack different modes at one start: that is an overlap', () => {
		const cs = findConflicts({
			universes: [u3],
			modes,
			fixtures: [dmx(30, 1, { id: 1, number: 1 }), dmx(30, 1, { id: 2, number: 2, modeId: 2, linkGroup: null })]
		});
		expect(kinds(cs)).toEqual(['overlap']);
		expect(cs[0]?.slots).toEqual([1, 2, 3, 4]);
	});

	it('allows an exact fit ending at 512 and flags 506 for 8 slots as overflow (E1.11: 512 slots)', () => {
		const ok = findConflicts({
			universes: [u3],
			modes,
			fixtures: [dmx(30, 505, { modeId: 2 }), dmx(30, 509, { modeId: 1 })]
		});
		expect(ok.filter((c) => c.kind === 'overflow')).toEqual([]);
		const over = findConflicts({ universes: [u3], modes, fixtures: [dmx(30, 506, { id: 7, number: 7, modeId: 2 })] });
		expect(over).toEqual([
			{
				kind: 'overflow',
				severity: 'error',
				universeId: 30,
				slots: [506, 507, 508, 509, 510, 511, 512],
				fixtureIds: [7],
				message:
					'Fixture 7 needs 8 slots from address 506 of universe 3, running to slot 513 past 512 — start it at 505 or lower.'
			}
		]);
	});

	it('flags address 0, 513, a missing universe and an unknown universe as out of range', () => {
		const fs = [
			dmx(30, 0, { number: 1 }),
			dmx(30, 513, { number: 2 }),
			fixture({ kind: 'dmx', universeId: null, address: 1 }, { number: 3 }),
			dmx(99, 1, { number: 4 })
		];
		const cs = findConflicts({ universes: [u3], modes, fixtures: fs });
		expect(kinds(cs)).toEqual(['out-of-range', 'out-of-range', 'out-of-range', 'out-of-range']);
		expect(cs.map((c) => c.message)).toContain('Fixture 1 has address 0 in universe 3, outside 1–512 — pick 1–509.');
		expect(cs.map((c) => c.message)).toContain('Fixture 3 has no universe — choose one.');
	});

	it('flags a dmx-map address out of range or missing', () => {
		const sparse: Mode = { id: 3, name: 'map', channels: [channel(1, 'intensity'), channel(2, 'hue')] };
		const f = fixture(
			{ kind: 'dmx-map', universeId: 30, addresses: { intensity: 600 } },
			{ id: 5, number: 5, modeId: 3 }
		);
		const cs = findConflicts({ universes: [u3], modes: [sparse], fixtures: [f] });
		expect(cs.map((c) => c.message)).toEqual([
			'Fixture 5 has no address for hue in universe 3 — give it one from 1 to 512.',
			'Fixture 5 puts intensity at 600 in universe 3, outside 1–512 — pick 1–512.'
		]);
	});

	it('is deterministic whatever order the fixtures come in', () => {
		const fs = [
			dmx(30, 1, { number: 5 }),
			dmx(30, 2, { number: 2 }),
			dmx(30, 1, { number: 9 }),
			dmx(30, 510, { number: 1 })
		];
		const once = findConflicts({ universes: [u3], modes, fixtures: fs });
		expect(findConflicts({ universes: [u3], modes, fixtures: [...fs].reverse() })).toEqual(once);
		expect(once.length).toBeGreaterThan(2);
	});
});

describe('line-overload — EIA-485: 32 unit loads per segment without a splitter', () => {
	const wired = universe(1, 1, 'dmx-wired');
	const modes = [plainMode(1, 1)];

	it('allows 32 units on a wired line and warns at 33, counting daisy-chained followers', () => {
		const leaders = Array.from({ length: 31 }, (_, i) => dmx(1, i + 1, { id: i + 1, number: i + 1 }));
		const follower = fixture({ kind: 'follow', leaderId: 1 }, { id: 100, number: 100 });
		const ok = findConflicts({ universes: [wired], modes, fixtures: [...leaders, follower] });
		expect(ok).toEqual([]);
		const second = fixture({ kind: 'follow', leaderId: 100 }, { id: 101, number: 101 });
		const over = findConflicts({ universes: [wired], modes, fixtures: [...leaders, follower, second] });
		expect(over.map((c) => [c.kind, c.severity, c.fixtureIds.length])).toEqual([['line-overload', 'warning', 33]]);
		expect(over[0]?.fixtureIds).toContain(101);
	});

	it('does not count units on sACN or wireless universes', () => {
		const fs = Array.from({ length: 40 }, (_, i) => dmx(2, i + 1, { id: i + 1, number: i + 1 }));
		expect(findConflicts({ universes: [universe(2, 2, 'dmx-wireless')], modes, fixtures: fs })).toEqual([]);
	});

	it('reports a follow cycle once, naming every fixture on it (nothing drives a circle — common practice)', () => {
		const a = fixture({ kind: 'follow', leaderId: 2 }, { id: 1, number: 1 });
		const b = fixture({ kind: 'follow', leaderId: 1 }, { id: 2, number: 2 });
		const cs = findConflicts({ universes: [wired], modes, fixtures: [a, b] });
		expect(cs.map((c) => [c.kind, c.severity, c.fixtureIds])).toEqual([['follow-cycle', 'error', [1, 2]]]);
		expect(cs[0].message).toContain('Fixtures 1 and 2 follow each other in a circle');
	});
});

describe('rc conflicts', () => {
	const rx: Receiver = { id: 7, protocol: 'sbus', channelCount: 18, name: 'Car' };
	const modes: Mode[] = [{ id: 1, name: 'rc', channels: [channel(null, 'intensity'), channel(null, 'hue')] }];
	const rc = (channels: Record<string, number>, over: Partial<PatchFixture> = {}): PatchFixture =>
		fixture({ kind: 'rc', receiverId: 7, channels }, over);

	it('flags one channel driving two different parameters', () => {
		const cs = findConflicts({
			universes: [],
			modes,
			receivers: [rx],
			fixtures: [rc({ intensity: 1, hue: 2 }, { id: 1, number: 1 }), rc({ intensity: 3, hue: 1 }, { id: 2, number: 2 })]
		});
		expect(cs).toEqual([
			{
				kind: 'rc-collision',
				severity: 'error',
				receiverId: 7,
				channels: [1],
				fixtureIds: [1, 2],
				message:
					'Channel 1 of receiver "Car" drives intensity of fixture 1, hue of fixture 2 — give each parameter its own channel, or link the fixtures.'
			}
		]);
	});

	it('allows link group members to share a channel for the same parameter, but not unlinked fixtures', () => {
		const linked = [1, 2].map((n) => rc({ intensity: 1, hue: 2 }, { id: n, number: n, linkGroup: 'boat' }));
		expect(findConflicts({ universes: [], modes, receivers: [rx], fixtures: linked })).toEqual([]);
		const unlinked = [1, 2].map((n) => rc({ intensity: 1, hue: 2 }, { id: n, number: n }));
		expect(kinds(findConflicts({ universes: [], modes, receivers: [rx], fixtures: unlinked }))).toEqual([
			'rc-collision',
			'rc-collision'
		]);
	});

	it('warns when a parameter has no channel or one beyond the receiver', () => {
		const cs = findConflicts({
			universes: [],
			modes,
			receivers: [{ ...rx, channelCount: 8 }],
			fixtures: [rc({ intensity: 9 }, { id: 3, number: 3 })]
		});
		expect(cs.map((c) => [c.kind, c.severity, c.channels])).toEqual([
			['rc-unassigned', 'warning', undefined],
			['rc-unassigned', 'warning', [9]]
		]);
		expect(cs[0]?.message).toBe('Fixture 3 has no channel on receiver "Car" for hue — assign one.');
	});
});

// Property: the sweep equals a brute-force slot-by-slot oracle.
function bytes(bits: Bits): number {
	return bits / 8;
}

function oracleSlots(f: PatchFixture, mode: Mode, universes: readonly Universe[]): number[] {
	const c = f.control;
	if ((c.kind !== 'dmx' && c.kind !== 'dmx-map') || !universes.some((u) => u.id === c.universeId)) return [];
	const out: number[] = [];
	const inRange = (a: number | undefined): a is number => a !== undefined && Number.isInteger(a) && a >= 1 && a <= 512;
	if (c.kind === 'dmx') {
		let len = mode.slots ?? 0;
		for (const ch of mode.channels) if (ch.offset !== null) len = Math.max(len, ch.offset + bytes(ch.bits) - 1);
		if (inRange(c.address)) for (let s = c.address; s < c.address + len && s <= 512; s++) out.push(s);
	} else {
		const done = new Set<string>();
		for (const ch of mode.channels) {
			if (ch.offset === null || done.has(ch.parameter)) continue;
			done.add(ch.parameter);
			const a = Object.hasOwn(c.addresses, ch.parameter) ? c.addresses[ch.parameter] : undefined;
			if (inRange(a)) for (let s = a; s < a + bytes(ch.bits) && s <= 512; s++) out.push(s);
		}
	}
	return out;
}

function oracle(input: PatchInput & { modes: Mode[] }): { overlaps: string[]; stacks: string[] } {
	const modeOf = new Map(input.modes.map((m) => [m.id, m]));
	const slotsOf = new Map<number, number[]>();
	const layout = new Map<number, string>();
	for (const f of input.fixtures) {
		const mode = modeOf.get(f.modeId);
		if (mode === undefined) continue;
		const slots = oracleSlots(f, mode, input.universes);
		if (slots.length === 0) continue;
		slotsOf.set(f.id, slots);
		const c = f.control;
		const where =
			c.kind === 'dmx'
				? `${c.address}`
				: c.kind === 'dmx-map'
					? mode.channels
							.filter((ch) => ch.offset !== null)
							.map((ch) => `${ch.parameter}=${c.addresses[ch.parameter]}`)
							.join(',')
					: '';
		layout.set(
			f.id,
			`${c.kind === 'dmx' || c.kind === 'dmx-map' ? c.universeId : ''}|${c.kind}|${f.typeId}|${f.modeId}|${where}`
		);
	}
	const byId = new Map(input.fixtures.map((f) => [f.id, f]));
	const universeOf = (id: number): number | null => {
		const c = byId.get(id)?.control;
		return c !== undefined && (c.kind === 'dmx' || c.kind === 'dmx-map') ? c.universeId : null;
	};
	const pairs = new Map<string, Set<number>>();
	const ids = [...slotsOf.keys()].sort((a, b) => (byId.get(a)?.number ?? 0) - (byId.get(b)?.number ?? 0));
	for (let i = 0; i < ids.length; i++) {
		const a = ids[i] as number;
		const sa = slotsOf.get(a) ?? [];
		// A fixture that maps two parameters onto one slot overlaps itself.
		const dup = sa.filter((s, k) => sa.indexOf(s) !== k);
		if (dup.length > 0) pairs.set(`${a}`, new Set(dup));
		for (let j = i + 1; j < ids.length; j++) {
			const b = ids[j] as number;
			if (universeOf(a) !== universeOf(b) || layout.get(a) === layout.get(b)) continue;
			for (let s = 1; s <= 512; s++) {
				if (sa.includes(s) && (slotsOf.get(b) ?? []).includes(s)) {
					const key = `${a},${b}`;
					const set = pairs.get(key) ?? new Set<number>();
					set.add(s);
					pairs.set(key, set);
				}
			}
		}
	}
	const overlaps = [...pairs].map(([k, set]) => `${k}:${[...set].sort((x, y) => x - y).join(' ')}`).sort();
	const classes = new Map<string, number[]>();
	for (const id of ids) classes.set(layout.get(id) ?? '', [...(classes.get(layout.get(id) ?? '') ?? []), id]);
	const stacks = [...classes.values()]
		.filter((m) => m.length > 1)
		.map((m) => {
			const g = byId.get(m[0] as number)?.linkGroup ?? null;
			return `${g !== null && m.every((id) => byId.get(id)?.linkGroup === g) ? 'linked' : 'shared'}:${m.join(',')}`;
		})
		.sort();
	return { overlaps, stacks };
}

const modeArb: fc.Arbitrary<Omit<Mode, 'id'>> = fc
	.array(
		fc.record({
			offset: fc.option(fc.integer({ min: 1, max: 10 }), { freq: 5 }),
			bits: fc.constantFrom<Bits>(8, 16, 24)
		}),
		{ minLength: 1, maxLength: 4 }
	)
	.map((chs) => ({ name: 'm', channels: chs.map((c, i) => channel(c.offset, `p${i}`, c.bits)) }));

const addressArb = fc.oneof(
	fc.integer({ min: 1, max: 24 }),
	fc.integer({ min: 0, max: 514 }),
	fc.constantFrom(505, 506, 509, 511, 512, 513)
);

const patchArb = fc.array(modeArb, { minLength: 1, maxLength: 3 }).chain((ms) => {
	const modes: Mode[] = ms.map((m, i) => ({ ...m, id: i + 1 }));
	const universes = [universe(1, 1, 'dmx-wired'), universe(2, 2)];
	const fixtureArb = fc.record({
		modeIdx: fc.integer({ min: 0, max: modes.length - 1 }),
		typeId: fc.constantFrom(1, 1, 2),
		linkGroup: fc.constantFrom<string | null>(null, 'A', 'B'),
		universeId: fc.constantFrom<number | null>(1, 1, 2, null, 9),
		sparse: fc.boolean(),
		address: addressArb,
		addresses: fc.array(fc.option(addressArb, { freq: 6 }), { minLength: 4, maxLength: 4 }),
		// Clones of an earlier fixture make stacks (shared / linked), sparse ones included.
		copyOf: fc.option(fc.nat(), { freq: 3 })
	});
	return fc.array(fixtureArb, { maxLength: 30 }).map((raw) => {
		const fixtures: PatchFixture[] = [];
		raw.forEach((r, i) => {
			const mode = modes[r.modeIdx] as Mode;
			const addresses: Record<string, number> = {};
			mode.channels.forEach((ch, k) => {
				const a = r.addresses[k];
				if (a !== null && a !== undefined) addresses[ch.parameter] = a;
			});
			const original = r.copyOf === null || i === 0 ? undefined : fixtures[r.copyOf % i];
			fixtures.push({
				id: 1000 + i,
				number: 50 - i,
				label: `F${i}`,
				typeId: original?.typeId ?? r.typeId,
				modeId: original?.modeId ?? mode.id,
				linkGroup: r.linkGroup,
				control:
					original?.control ??
					(r.sparse
						? { kind: 'dmx-map', universeId: r.universeId, addresses }
						: { kind: 'dmx', universeId: r.universeId, address: r.address })
			});
		});
		return { universes, modes, fixtures };
	});
});

describe('conflicts — property: sweep equals a brute-force slot-by-slot oracle', () => {
	it('reports the same overlaps (with exact slots) and the same shared / linked stacks', () => {
		fc.assert(
			fc.property(patchArb, (input) => {
				const cs = findConflicts(input);
				const want = oracle(input);
				const overlaps = cs
					.filter((c) => c.kind === 'overlap')
					.map((c) => `${c.fixtureIds.join(',')}:${(c.slots ?? []).join(' ')}`)
					.sort();
				const stacks = cs
					.filter((c) => c.kind === 'shared' || c.kind === 'linked')
					.map((c) => `${c.kind}:${c.fixtureIds.join(',')}`)
					.sort();
				expect(overlaps).toEqual(want.overlaps);
				expect(stacks).toEqual(want.stacks);
			}),
			{ numRuns: 400 }
		);
	});

	it('flags overflow exactly when a claimed slot would pass 512', () => {
		fc.assert(
			fc.property(patchArb, (input) => {
				const over = new Set(
					findConflicts(input)
						.filter((c) => c.kind === 'overflow')
						.flatMap((c) => c.fixtureIds)
				);
				for (const f of input.fixtures) {
					const c = f.control;
					const mode = input.modes.find((m) => m.id === f.modeId) as Mode;
					let expected = false;
					if ((c.kind === 'dmx' || c.kind === 'dmx-map') && (c.universeId === 1 || c.universeId === 2)) {
						for (const ch of mode.channels) {
							if (ch.offset === null) continue;
							const a = c.kind === 'dmx' ? c.address : c.addresses[ch.parameter];
							const first = c.kind === 'dmx' ? (a ?? 0) + ch.offset - 1 : (a ?? 0);
							if (a !== undefined && Number.isInteger(a) && a >= 1 && a <= 512 && first + bytes(ch.bits) - 1 > 512)
								expected = true;
						}
					}
					expect(over.has(f.id)).toBe(expected);
				}
			}),
			{ numRuns: 300 }
		);
	});
});

describe('sweep — both sort strategies agree', () => {
	it('gives the same overlaps and stacks with the counting sort and the comparison sort', () => {
		const runArb = fc.array(
			fc.record({ start: fc.integer({ min: 1, max: 40 }), len: fc.integer({ min: 0, max: 6 }) }),
			{ minLength: 1, maxLength: 3 }
		);
		const claimsArb = fc
			.array(fc.record({ universe: fc.integer({ min: 0, max: 3 }), runs: runArb }), { maxLength: 25 })
			.map((cs) =>
				cs.map((c) => {
					// Make the runs of one claim disjoint and sorted, as footprints are.
					const runs: { start: number; end: number }[] = [];
					let at = 0;
					for (const r of c.runs) {
						const start = Math.max(r.start, at + 2);
						runs.push({ start, end: start + r.len });
						at = start + r.len;
					}
					return { universe: c.universe, runs };
				})
			);
		fc.assert(
			fc.property(claimsArb, (claims) => {
				const same = (a: number, b: number): boolean => JSON.stringify(claims[a]) === JSON.stringify(claims[b]);
				const counting = sweep(claims, same);
				expect(sweep(claims, same, { comparisonSort: true })).toEqual(counting);
			}),
			{ numRuns: 300 }
		);
	});
});

describe('follow, mode and link-group conflicts', () => {
	const u1 = universe(1, 1);
	const modes = [plainMode(1, 4), plainMode(2, 8)];
	const follow = (leaderId: number, over: Partial<PatchFixture>) => fixture({ kind: 'follow', leaderId }, over);

	it('a fixture following itself is a follow-cycle', () => {
		const cs = findConflicts({ universes: [u1], modes, fixtures: [follow(5, { id: 5, number: 5 })] });
		expect(cs.map((c) => [c.kind, c.fixtureIds])).toEqual([['follow-cycle', [5]]]);
		expect(cs[0].message).toBe('Fixture 5 follows itself, so nothing drives it — give it a leader or its own address.');
	});

	it('a chain into a cycle names only the cycle; a chain to an addressed leader is fine', () => {
		const lead = dmx(1, 1, { id: 1, number: 1 });
		const ok = follow(1, { id: 2, number: 2 });
		const c1 = follow(4, { id: 3, number: 3 });
		const c2 = follow(3, { id: 4, number: 4 });
		const tail = follow(3, { id: 6, number: 6 });
		const cs = findConflicts({ universes: [u1], modes, fixtures: [lead, ok, c1, c2, tail] });
		expect(cs.map((c) => [c.kind, c.fixtureIds])).toEqual([['follow-cycle', [3, 4]]]);
	});

	it('a follower whose leader is not in the project is a missing-leader', () => {
		const cs = findConflicts({ universes: [u1], modes, fixtures: [follow(99, { id: 7, number: 7 })] });
		expect(cs.map((c) => [c.kind, c.severity, c.fixtureIds])).toEqual([['missing-leader', 'error', [7]]]);
	});

	it('a fixture whose mode is unknown is an unknown-mode error instead of silently claiming nothing', () => {
		const cs = findConflicts({ universes: [u1], modes, fixtures: [dmx(1, 1, { id: 8, number: 8, modeId: 42 })] });
		expect(cs.map((c) => [c.kind, c.severity, c.fixtureIds])).toEqual([['unknown-mode', 'error', [8]]]);
		expect(cs[0].message).toContain('mode id 42');
	});

	it('link-group members that differ in universe, address or mode are a link-mismatch', () => {
		const u2 = universe(2, 2);
		const a = dmx(1, 10, { id: 1, number: 1, linkGroup: 'L' });
		const b = dmx(2, 10, { id: 2, number: 2, linkGroup: 'L' });
		const c = dmx(1, 20, { id: 3, number: 3, linkGroup: 'M' });
		const d = dmx(1, 30, { id: 4, number: 4, linkGroup: 'M' });
		const e = dmx(1, 40, { id: 5, number: 5, linkGroup: 'N' });
		const g = dmx(1, 40, { id: 6, number: 6, linkGroup: 'N', modeId: 2 });
		const cs = findConflicts({ universes: [u1, u2], modes, fixtures: [a, b, c, d, e, g] });
		const mismatch = cs.filter((x) => x.kind === 'link-mismatch');
		expect(mismatch.map((x) => [x.severity, x.fixtureIds])).toEqual([
			['warning', [1, 2]],
			['warning', [3, 4]],
			['warning', [5, 6]]
		]);
		expect(mismatch[0].message).toContain('differ in universe (');
		expect(mismatch[1].message).toContain('differ in address (');
		expect(mismatch[2].message).toContain('differ in mode (');
	});

	it('matching link-group members give only the linked note', () => {
		const a = dmx(1, 10, { id: 1, number: 1, linkGroup: 'L' });
		const b = dmx(1, 10, { id: 2, number: 2, linkGroup: 'L' });
		expect(kinds(findConflicts({ universes: [u1], modes, fixtures: [a, b] }))).toEqual(['linked']);
	});
});

describe('DMX breaks (DIN SPEC 15800 DMX mode: a mode may span several breaks)', () => {
	const u1 = universe(1, 1);
	const u2 = universe(2, 2);
	// break 1: slots 1–4; break 2: slots 1–3
	const twoBreak: Mode = {
		id: 9,
		name: 'split',
		channels: [channel(1, 'a', 32), { ...channel(1, 'b', 24), dmxBreak: 2 }]
	};
	const split = (
		address: number,
		b2: { universeId: number; address: number } | undefined,
		over: Partial<PatchFixture>
	) =>
		fixture(
			{ kind: 'dmx', universeId: 1, address, ...(b2 ? { breaks: [{ dmxBreak: 2, ...b2 }] } : {}) },
			{ modeId: 9, ...over }
		);

	it('each break claims its own universe and address; footprints carry both', () => {
		const f = split(10, { universeId: 2, address: 100 }, { id: 1, number: 1 });
		const other = dmx(2, 101, { id: 2, number: 2, modeId: 1 });
		const a = analysePatch({ universes: [u1, u2], modes: [twoBreak, plainMode(1, 4)], fixtures: [f, other] });
		expect(a.footprints[0]).toEqual({
			fixtureId: 1,
			footprint: 4,
			universeId: 1,
			ranges: [{ start: 10, end: 13 }],
			breaks: [{ dmxBreak: 2, footprint: 3, universeId: 2, ranges: [{ start: 100, end: 102 }] }]
		});
		expect(a.conflicts.map((c) => [c.kind, c.universeId, c.slots])).toEqual([['overlap', 2, [101, 102]]]);
		expect(a.conflicts[0].message).toBe(
			'Fixtures 1 (break 2) and 2 both claim slots 101–102 of universe 2 — move one.'
		);
	});

	it('a missing second break address is an out-of-range error naming the break', () => {
		const cs = findConflicts({
			universes: [u1],
			modes: [twoBreak],
			fixtures: [split(1, undefined, { id: 3, number: 3 })]
		});
		expect(cs.map((c) => c.kind)).toEqual(['out-of-range']);
		expect(cs[0].message).toContain('DMX break 2');
	});

	it("a fixture's two breaks on the same slots overlap each other", () => {
		const cs = findConflicts({
			universes: [u1],
			modes: [twoBreak],
			fixtures: [split(1, { universeId: 1, address: 3 }, { id: 4, number: 4 })]
		});
		expect(cs.map((c) => [c.kind, c.fixtureIds, c.slots])).toEqual([['overlap', [4], [3, 4]]]);
	});
});
