import { describe, expect, it } from 'vitest';
import {
	describeChanges,
	diffPatches,
	historyText,
	whereText,
	type SnapshotFixture,
	type SnapshotRecord
} from '../../../src/lib/patch';

// Invented rig: one type with an 8-bit and a 16-bit HSIC mode; two universes.
const types: SnapshotRecord[] = [
	{
		id: 7,
		maker: 'Ferrywright',
		model: 'Tube 4',
		modes: [
			{ id: 10, name: 'HSIC 8-bit', slots: 4, channels: [] },
			{ id: 11, name: 'HSIC 16-bit', slots: 8, channels: [] }
		]
	}
];
const universes: SnapshotRecord[] = [
	{ id: 31, number: 1, name: 'Deck', transport: 'dmx-wired' },
	{ id: 32, number: 2, name: 'Bow', transport: 'sacn' }
];
const receivers: SnapshotRecord[] = [{ id: 40, name: 'Tender boat RX', protocol: 'sbus', channelCount: 16 }];

const fx = (over: Partial<SnapshotFixture> = {}): SnapshotFixture => ({
	id: 1,
	number: 5,
	label: 'DECK 5',
	typeId: 7,
	modeId: 10,
	linkGroup: null,
	position: 'Deck',
	state: 'planned',
	notes: '',
	control: { kind: 'dmx', universeId: 31, address: 17 },
	version: 1,
	...over
});

function words(before: SnapshotFixture[], after: SnapshotFixture[], afterUniverses = universes) {
	const b = { fixtures: before, universes, types, receivers };
	const a = { fixtures: after, universes: afterUniverses, types, receivers };
	return describeChanges(diffPatches(b, a), b, a);
}

describe('describeChanges', () => {
	it('says where a fixture moved as universe.address, never the universe id', () => {
		const d = words([fx()], [fx({ control: { kind: 'dmx', universeId: 32, address: 161 }, version: 2 })]);
		expect(d.plan.map((l) => l.text)).toEqual(['Fixture 5 DECK 5 moved from 1.17 to 2.161']);
		expect(d.progress).toEqual([]);
	});

	it('names modes and their slot counts instead of mode ids', () => {
		const d = words([fx({ number: 10, label: '' })], [fx({ number: 10, label: '', modeId: 11 })]);
		expect(d.plan[0].text).toBe('Fixture 10 mode HSIC 8-bit → HSIC 16-bit (4 → 8 slots)');
		expect(d.plan[0].text).not.toMatch(/modeId|\b11\b/);
	});

	it('keeps state and notes apart from the plan', () => {
		const d = words([fx()], [fx({ state: 'addressed', notes: 'menu reads 1.17' })]);
		expect(d.plan).toEqual([]);
		expect(d.progress.map((l) => l.text)).toEqual([
			'Fixture 5 DECK 5 marked addressed (was planned); note now reads “menu reads 1.17”'
		]);
	});

	it('words added and removed fixtures with their type, mode and place', () => {
		const rc = fx({
			id: 2,
			number: 6,
			label: 'TENDER',
			control: { kind: 'rc', receiverId: 40, channels: { hue: 3, intensity: 1 } }
		});
		const d = words([fx()], [rc]);
		expect(d.plan.map((l) => [l.kind, l.text])).toEqual([
			['added', 'Fixture 6 TENDER added: Ferrywright Tube 4 HSIC 8-bit, radio Tender boat RX channels 1, 3'],
			['removed', 'Fixture 5 DECK 5 removed (was Ferrywright Tube 4 HSIC 8-bit, 1.17)']
		]);
	});

	// A renumbered universe is one line, not one per fixture in it: the fixtures' own records did not change.
	it('words a universe transport change by display name, in one line for the universe', () => {
		const after = [{ ...universes[0], number: 3, transport: 'artnet' }, universes[1]];
		const d = words([fx()], [fx()], after);
		expect(d.plan.map((l) => l.text)).toEqual(['Universe 3 Deck: renumbered from 1 to 3; now Art-Net (was Wired DMX)']);
	});
});

// DIN SPEC 15800 DMX mode: a fixture over two breaks has a start address per break.
describe('a fixture over two DMX breaks in words', () => {
	const ctx = {
		universes: new Map([
			[1, { id: 1, number: 1 }],
			[2, { id: 2, number: 2 }]
		]),
		receivers: new Map(),
		fixtures: new Map(),
		modes: new Map()
	};
	it("says each break's universe.address, so moving break 2 is a change in the history", () => {
		const at = (address: number) => ({
			kind: 'dmx' as const,
			universeId: 1,
			address: 1,
			breaks: [{ dmxBreak: 2, universeId: 2, address }]
		});
		expect(whereText(at(10), ctx)).toBe('1.1, break 2 2.10');
		const text = historyText(
			'fixture.update',
			{ id: 5, number: 5, control: at(10) },
			{ id: 5, number: 5, control: at(101) },
			ctx
		);
		expect(text).not.toBe('saved it unchanged');
		expect(text).toContain('break 2 2.101');
	});
});
