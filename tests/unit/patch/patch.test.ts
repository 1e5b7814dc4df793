import { describe, expect, it } from 'vitest';
import { assignRc, computePatch, findConflicts, type Mode, type PatchFixture } from '../../../src/lib/patch';
import { channel, dmx, fixture, plainMode, universe } from './factories';

describe('computePatch — what GET /patch answers', () => {
	const modes: Mode[] = [
		plainMode(1, 8),
		{ id: 2, name: 'map', channels: [channel(1, 'intensity', 16), channel(3, 'hue')] }
	];

	it('gives each fixture its slot ranges and each universe its use, refresh and wire numbers', () => {
		const fs = [
			dmx(1, 505, { id: 1, number: 1 }),
			fixture(
				{ kind: 'dmx-map', universeId: 1, addresses: { intensity: 10, hue: 30 } },
				{ id: 2, number: 2, modeId: 2 }
			),
			fixture({ kind: 'manual' }, { id: 3, number: 3 })
		];
		const r = computePatch({
			universes: [universe(1, 17, 'artnet'), universe(2, 256)],
			modes,
			fixtures: fs,
			artnetOffset: 1
		});
		expect(r.fixtures).toEqual([
			{ fixtureId: 1, footprint: 8, universeId: 1, ranges: [{ start: 505, end: 512 }] },
			{
				fixtureId: 2,
				footprint: 3,
				universeId: 1,
				ranges: [
					{ start: 10, end: 11 },
					{ start: 30, end: 30 }
				]
			},
			{ fixtureId: 3, footprint: 8, universeId: null, ranges: [] }
		]);
		expect(r.conflicts).toEqual([]);
		const [u17, u256] = r.universes;
		expect(u17).toMatchObject({
			universeId: 1,
			number: 17,
			slotsUsed: 512,
			frameUs: 22676,
			sacn: { universe: 17, group: '239.255.0.17' },
			artnet: { net: 0, subnet: 1, universe: 0, portAddress: 16 }
		});
		expect(u256).toMatchObject({
			slotsUsed: 0,
			frameUs: 1204,
			sacn: { group: '239.255.1.0' },
			artnet: { portAddress: 255 }
		});
	});

	it('returns the same conflicts as findConflicts', () => {
		const fs = [dmx(1, 1, { id: 1, number: 1 }), dmx(1, 4, { id: 2, number: 2 })];
		const input = { universes: [universe(1)], modes, fixtures: fs };
		expect(computePatch(input).conflicts).toEqual(findConflicts(input));
		expect(findConflicts(input).map((c) => c.slots)).toEqual([[4, 5, 6, 7, 8]]);
	});

	it('accepts modes as a map by id', () => {
		const fs = [dmx(1, 1, { id: 1, number: 1 }), dmx(1, 4, { id: 2, number: 2 })];
		const asMap = new Map(modes.map((m) => [m.id, m]));
		expect(findConflicts({ universes: [universe(1)], modes: asMap, fixtures: fs })).toEqual(
			findConflicts({ universes: [universe(1)], modes, fixtures: fs })
		);
	});

	it('finds no RC conflict in what assignRc hands out, link groups included', () => {
		const rcMode: Mode = {
			id: 3,
			name: 'rc',
			channels: [channel(null, 'intensity'), channel(null, 'cct'), channel(null, 'hue')]
		};
		const groups = [null, 'car', null, 'car', 'boat', null, 'boat'];
		const rcFixtures = groups.map((g, i) => ({
			id: i + 1,
			number: i + 1,
			linkGroup: g,
			parameters: ['intensity', 'cct', 'hue']
		}));
		const { assigned, unassigned } = assignRc({ receiver: { id: 9, protocol: 'sbus' }, fixtures: rcFixtures });
		expect(unassigned).toEqual([]);
		const patched: PatchFixture[] = rcFixtures.map((f) => {
			const channels: Record<string, number> = {};
			for (const a of assigned) if (a.fixtureId === f.id) channels[a.parameter] = a.channel;
			return fixture(
				{ kind: 'rc', receiverId: 9, channels },
				{ id: f.id, number: f.number, modeId: 3, linkGroup: f.linkGroup }
			);
		});
		expect(
			findConflicts({
				universes: [],
				modes: [rcMode],
				receivers: [{ id: 9, protocol: 'sbus', channelCount: 18 }],
				fixtures: patched
			})
		).toEqual([]);
	});
});

describe('computePatch — universe figures', () => {
	const modes: Mode[] = [plainMode(1, 4)];

	it('says the highest used slot and the count of used slots apart, and both refresh figures', () => {
		const fs = [dmx(1, 1, { id: 1, number: 1 }), dmx(1, 21, { id: 2, number: 2 })];
		const [u] = computePatch({ universes: [universe(1)], modes, fixtures: fs }).universes;
		expect(u).toMatchObject({ slotsUsed: 24, slotCount: 8 });
		expect(u.refreshText).toBe('up to 830 Hz if the transmitter sends 24 slots; 44 Hz at 512');
		expect(u.refreshFullHz).toBeCloseTo(1e6 / 22676, 6);
	});

	it('cautions when an Art-Net universe lands on port-address 0 (deprecated in Art-Net 4, from memory)', () => {
		const us = [universe(1, 1, 'artnet'), universe(2, 2, 'artnet'), universe(3, 1, 'sacn')];
		const withOffset = computePatch({ universes: us, modes, fixtures: [], artnetOffset: 1 }).universes;
		expect(withOffset.map((u) => u.artnet?.portAddress)).toEqual([0, 0, 1]);
		expect(withOffset[0].artnetCaution).toContain('port-address 0, which Art-Net 4 deprecates');
		expect(withOffset[1].artnetCaution).toBeNull(); // sACN universe: no Art-Net on the wire
		expect(withOffset[2].artnetCaution).toBeNull();
		const same = computePatch({ universes: us, modes, fixtures: [], artnetOffset: 0 }).universes;
		expect(same.map((u) => u.artnetCaution)).toEqual([null, null, null]);
	});
});
