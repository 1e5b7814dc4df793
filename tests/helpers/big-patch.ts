import {
	computeFor,
	type FixtureShape,
	type PatchData,
	type TypeShape,
	type UniverseShape
} from '../../src/lib/server/db/patch';

// A large invented patch built in memory (no database), for pagination tests and
// the sheet benchmarks: n fixtures of an 8-slot 16-bit mode, 64 to a universe.

export function bigPatch(n: number): PatchData {
	const type: TypeShape = {
		id: 1,
		maker: 'Bench Works',
		model: 'Test Panel 8',
		notes: '',
		version: 1,
		modes: [
			{
				id: 1,
				name: 'HSIC 16-bit',
				slots: 8,
				channels: ['intensity', 'hue', 'saturation', 'cct'].map((parameter, i) => ({
					offset: 1 + 2 * i,
					parameter,
					bits: 16 as const,
					default: 0
				}))
			}
		]
	};
	const perUniverse = 64;
	const universes: UniverseShape[] = [];
	for (let u = 1; u <= Math.ceil(n / perUniverse); u++) {
		universes.push({
			id: u,
			number: u,
			name: `Bench ${u}`,
			transport: u % 2 ? 'sacn' : 'artnet',
			notes: '',
			version: 1
		});
	}
	const fixtures: FixtureShape[] = [];
	for (let i = 0; i < n; i++) {
		fixtures.push({
			id: i + 1,
			number: 1001 + i,
			label: `BENCH ${i + 1}`,
			typeId: 1,
			modeId: 1,
			position: `Truss ${Math.floor(i / 16) + 1}, unit ${(i % 16) + 1}`,
			group: `Group ${(i % 7) + 1}`,
			linkGroup: null,
			colour: '',
			watts: 60,
			notes: i % 5 === 0 ? 'Check the clamp and the safety bond.' : '',
			state: 'planned',
			version: 1,
			look: { hue: null, saturation: null, intensity: null, cct: null },
			control: { kind: 'dmx', universeId: Math.floor(i / perUniverse) + 1, address: 1 + (i % perUniverse) * 8 }
		});
	}
	const now = new Date(0).toISOString();
	const project = {
		id: 1,
		name: 'Bench rig',
		venue: '',
		startsOn: null,
		endsOn: null,
		notes: '',
		artnetOffset: 1,
		version: 1,
		createdAt: now,
		updatedAt: now
	};
	return computeFor(project, [type], universes, [], fixtures);
}
