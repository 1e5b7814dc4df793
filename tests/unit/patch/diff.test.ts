import { describe, expect, it } from 'vitest';
import { diffPatches, type SnapshotFixture } from '../../../src/lib/patch';

const base = (over: Partial<SnapshotFixture> = {}): SnapshotFixture => ({
	id: 1,
	number: 101,
	label: 'CAR KEY 1',
	typeId: 1,
	modeId: 2,
	linkGroup: null,
	control: { kind: 'dmx', universeId: 3, address: 1 },
	notes: '',
	version: 1,
	...over
});

describe('diffPatches', () => {
	it('reports field-level changes, nested control included, and ignores version', () => {
		const before = { fixtures: [base()] };
		const after = {
			fixtures: [base({ label: 'CAR KEY 2', control: { kind: 'dmx', universeId: 3, address: 9 }, version: 5 })]
		};
		expect(diffPatches(before, after).changed).toEqual([
			{
				fixtureId: 1,
				number: 101,
				label: 'CAR KEY 2',
				fields: [
					{ field: 'control.address', before: 1, after: 9 },
					{ field: 'label', before: 'CAR KEY 1', after: 'CAR KEY 2' }
				]
			}
		]);
	});

	it('shows a change of control kind as the fields that came and went', () => {
		const after = base({ control: { kind: 'dmx-map', universeId: 3, addresses: { intensity: 20, hue: 40 } } });
		const { changed } = diffPatches({ fixtures: [base()] }, { fixtures: [after] });
		expect(changed[0]?.fields).toEqual([
			{ field: 'control.address', before: 1, after: null },
			{ field: 'control.addresses.hue', before: null, after: 40 },
			{ field: 'control.addresses.intensity', before: null, after: 20 },
			{ field: 'control.kind', before: 'dmx', after: 'dmx-map' }
		]);
	});

	it('matches by id, falls back to fixture number, and lists what was added and removed', () => {
		const before = { fixtures: [base(), base({ id: 2, number: 102 }), base({ id: 3, number: 103 })] };
		const after = {
			fixtures: [base({ id: 20, number: 102, notes: 'swapped unit' }), base(), base({ id: 4, number: 104 })]
		};
		const d = diffPatches(before, after);
		expect(d.added.map((f) => f.id)).toEqual([4]);
		expect(d.removed.map((f) => f.id)).toEqual([3]);
		expect(d.changed).toEqual([
			{
				fixtureId: 20,
				number: 102,
				label: 'CAR KEY 1',
				fields: [{ field: 'notes', before: '', after: 'swapped unit' }]
			}
		]);
	});

	it('finds nothing between a snapshot and itself, and diffs universes too', () => {
		const snap = { fixtures: [base()], universes: [{ id: 1, number: 1, name: 'Dock', transport: 'sacn' }] };
		const d = diffPatches(snap, snap);
		expect(d.changed).toEqual([]);
		expect(d.universes.changed).toEqual([]);
		const moved = diffPatches(snap, {
			...snap,
			universes: [{ id: 1, number: 1, name: 'Dock, stage left', transport: 'sacn' }]
		});
		expect(moved.universes.changed).toEqual([
			{ id: 1, fields: [{ field: 'name', before: 'Dock', after: 'Dock, stage left' }] }
		]);
	});
});
