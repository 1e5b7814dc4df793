import {
	computeFor,
	type FixtureShape,
	type PatchData,
	type ReceiverShape,
	type TypeShape,
	type UniverseShape
} from '../../src/lib/server/db/patch';

// An invented rig like the demo's, built in memory (no database), for the sheet tests: 30 fixtures
// on three universes (one numbered 4) (16-bit panels with a follower, lantern balls, a linked tube chain, a puck
// with an address per parameter), four radio-driven pucks (two linked) and one set by hand.

type Channel = TypeShape['modes'][number]['channels'][number];
const ch = (offset: number | null, parameter: string, bits: 8 | 16 = 8): Channel => ({
	offset,
	parameter,
	bits,
	default: 0
});
const hsic = (bits: 8 | 16) =>
	['intensity', 'hue', 'saturation', 'cct'].map((p, i) => ch(bits === 8 ? i + 1 : 1 + 2 * i, p, bits));

const TYPES: TypeShape[] = [
	{
		id: 1,
		maker: 'Hollin & Vey',
		model: 'Skiff Panel 60',
		notes: '',
		version: 1,
		modes: [
			{ id: 11, name: 'HSIC 16-bit', slots: 8, channels: hsic(16) },
			{ id: 12, name: 'HSIC 8-bit', slots: 4, channels: hsic(8) }
		]
	},
	{
		id: 2,
		maker: 'Tessary',
		model: 'Lantern Ball 40',
		notes: '',
		version: 1,
		modes: [{ id: 21, name: 'CCT 8-bit', slots: 2, channels: [ch(1, 'intensity'), ch(2, 'cct')] }]
	},
	{
		id: 3,
		maker: 'Marrowlight',
		model: 'Reed Tube 120',
		notes: '',
		version: 1,
		modes: [{ id: 31, name: 'HSIC 8-bit', slots: 4, channels: hsic(8) }]
	},
	{
		id: 4,
		maker: 'Quayworks',
		model: 'Puck 8',
		notes: '',
		version: 1,
		modes: [{ id: 41, name: 'HSI 8-bit', slots: 3, channels: [ch(1, 'intensity'), ch(2, 'hue'), ch(3, 'saturation')] }]
	}
];

const UNIVERSES: UniverseShape[] = [
	{ id: 1, number: 1, name: 'Wheelhouse, wired', transport: 'dmx-wired', notes: 'Desk output A', version: 1 },
	{ id: 2, number: 2, name: 'Stern & river bank', transport: 'dmx-wireless', notes: '', version: 1 },
	{ id: 3, number: 4, name: 'Quay', transport: 'artnet', notes: 'Node in the quay distro box', version: 1 }
];

const RECEIVERS: ReceiverShape[] = [
	{
		id: 1,
		name: 'Tender boat RX',
		protocol: 'sbus',
		channelCount: 18,
		transmitterNotes: '',
		labels: {},
		version: 1
	}
];

export function demoLikePatch(): PatchData {
	const fixtures: FixtureShape[] = [];
	let id = 0;
	const add = (
		label: string,
		typeId: number,
		modeId: number,
		control: FixtureShape['control'],
		extra: Partial<FixtureShape> = {}
	) => {
		id++;
		fixtures.push({
			id,
			number: 100 + id,
			label,
			typeId,
			modeId,
			position: '',
			group: '',
			linkGroup: null,
			colour: '',
			watts: 60,
			notes: '',
			state: 'planned',
			version: 1,
			look: { hue: null, saturation: null, intensity: null, cct: null },
			control,
			...extra
		});
		return id;
	};
	for (let i = 0; i < 12; i++)
		add(
			`WHEEL ${i + 1}`,
			1,
			11,
			{ kind: 'dmx', universeId: 1, address: 1 + i * 8 },
			{
				position: i < 6 ? 'Wheelhouse ceiling, port' : 'Wheelhouse ceiling, starboard',
				group: 'Wheelhouse'
			}
		);
	add('WHEEL BALL A', 2, 21, { kind: 'dmx', universeId: 1, address: 97 }, { position: 'Over chart table' });
	add('WHEEL BALL B', 2, 21, { kind: 'dmx', universeId: 1, address: 99 }, { position: 'Over helm' });
	add('WHEEL 1 FOLLOW', 1, 11, { kind: 'follow', leaderId: 1 }, { position: 'Wheelhouse ceiling, port' });
	for (let i = 0; i < 3; i++)
		add(`STERN ${i + 1}`, 1, 12, { kind: 'dmx', universeId: 2, address: 1 + i * 4 }, { position: 'Stern rail' });
	for (let i = 0; i < 3; i++)
		add(
			`BANK TUBE ${i + 1}`,
			3,
			31,
			{ kind: 'dmx', universeId: 2, address: 41 },
			{
				position: `River bank stand ${i + 1}`,
				group: 'Bank',
				linkGroup: 'BANK-CHAIN'
			}
		);
	for (let i = 0; i < 3; i++)
		add(
			`QUAY BALL ${i + 1}`,
			2,
			21,
			{ kind: 'dmx', universeId: 3, address: 1 + i * 2 },
			{
				position: `Quay lamp post ${i + 1}`
			}
		);
	add(
		'QUAY PUCK',
		4,
		41,
		{ kind: 'dmx-map', universeId: 3, addresses: { intensity: 20, hue: 30, saturation: 31 } },
		{ position: 'Bollard 3' }
	);
	add('TENDER BOW', 4, 41, { kind: 'rc', receiverId: 1, channels: { intensity: 3, hue: 4, saturation: 5 } });
	add('TENDER STERN', 4, 41, { kind: 'rc', receiverId: 1, channels: { intensity: 6, hue: 7, saturation: 8 } });
	for (const side of ['PORT', 'STBD'])
		add(
			`TENDER ${side}`,
			4,
			41,
			{ kind: 'rc', receiverId: 1, channels: { intensity: 9, hue: 10, saturation: 11 } },
			{
				group: 'Tender',
				linkGroup: 'TENDER-SIDES'
			}
		);
	add('HAND LANTERN', 2, 21, { kind: 'manual' }, { notes: 'Set on the unit: 2700 K, 40 %.' });

	const now = new Date(0).toISOString();
	const project = {
		id: 1,
		name: 'Café Müller rig',
		venue: '',
		startsOn: null,
		endsOn: null,
		notes: '',
		artnetOffset: 1,
		version: 1,
		createdAt: now,
		updatedAt: now
	};
	return computeFor(project, TYPES, UNIVERSES, RECEIVERS, fixtures);
}

export const SHEET_TITLE = {
	project: 'Café Müller rig',
	revision: 'Revision 2',
	printed: '2026-05-01T09:00:00.000Z',
	signoff: 'r2 not signed off'
};
