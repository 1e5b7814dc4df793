import { and, eq, inArray } from 'drizzle-orm';
import { hashPassword } from './auth/password';
import type { Db } from './db/index';
import {
	circuits,
	packTypes,
	fixtureTypes,
	fixtures,
	memberships,
	modeChannels,
	modes,
	projects,
	receiverLabels,
	receivers,
	universes,
	users,
	type Role
} from './db/schema';

// The demo: an invented production ("The Lantern Ferry", a river drama shot on
// a moored ferry) with invented makers and models. Nothing here describes a
// real product.

export const DEMO_PASSWORD = 'patchwright-demo';
export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
	{ email: 'owner@demo.test', name: 'Ona Owner', role: 'owner' },
	{ email: 'programmer@demo.test', name: 'Pim Programmer', role: 'programmer' },
	{ email: 'electrician@demo.test', name: 'Elis Electrician', role: 'electrician' },
	{ email: 'viewer@demo.test', name: 'Vera Viewer', role: 'viewer' }
];
export const DEMO_PROJECT_NAME = 'The Lantern Ferry — river unit';

type Channel = {
	offset: number | null;
	parameter: string;
	bits?: 8 | 16;
	default?: number;
	min?: number;
	max?: number;
	unit?: string;
};

const CCT = { min: 2000, max: 10000, unit: 'K' };
const HUE = { min: 0, max: 360, unit: '°' };
const PCT = { min: 0, max: 100, unit: '%' };

const TYPES: {
	maker: string;
	model: string;
	notes: string;
	modes: { name: string; channels: Channel[]; inputVolts?: { min: number; max: number } }[];
}[] = [
	{
		maker: 'Hollin & Vey',
		model: 'Skiff Panel 60',
		notes: 'RGBW engine, 1×0.6 m soft panel, 14.4 V battery plate.',
		modes: [
			{
				name: 'HSIC 8-bit',
				channels: [
					{ offset: 1, parameter: 'intensity', ...PCT },
					{ offset: 2, parameter: 'hue', ...HUE },
					{ offset: 3, parameter: 'saturation', ...PCT },
					{ offset: 4, parameter: 'cct', default: 107, ...CCT }
				]
			},
			{
				name: 'HSIC 16-bit',
				channels: [
					{ offset: 1, parameter: 'intensity', bits: 16, ...PCT },
					{ offset: 3, parameter: 'hue', bits: 16, ...HUE },
					{ offset: 5, parameter: 'saturation', bits: 16, ...PCT },
					{ offset: 7, parameter: 'cct', bits: 16, default: 27_000, ...CCT }
				]
			},
			{
				name: 'RGBW 8-bit',
				channels: [
					{ offset: 1, parameter: 'intensity', ...PCT },
					{ offset: 2, parameter: 'red' },
					{ offset: 3, parameter: 'green' },
					{ offset: 4, parameter: 'blue' },
					{ offset: 5, parameter: 'white' }
				]
			}
		]
	},
	{
		maker: 'Marrowlight',
		model: 'Reed Tube 120',
		notes: '1.2 m pixel tube; internal battery, runs about 2 h at full.',
		modes: [
			{
				name: 'HSIC 8-bit',
				channels: [
					{ offset: 1, parameter: 'intensity', ...PCT },
					{ offset: 2, parameter: 'hue', ...HUE },
					{ offset: 3, parameter: 'saturation', ...PCT },
					{ offset: 4, parameter: 'cct', ...CCT }
				]
			},
			{
				// slot 10 is reserved by the maker: a gap that still belongs to the footprint
				name: 'HSIC 16-bit + FX',
				channels: [
					{ offset: 1, parameter: 'intensity', bits: 16, ...PCT },
					{ offset: 3, parameter: 'hue', bits: 16, ...HUE },
					{ offset: 5, parameter: 'saturation', bits: 16, ...PCT },
					{ offset: 7, parameter: 'cct', bits: 16, ...CCT },
					{ offset: 9, parameter: 'strobe' },
					{ offset: 11, parameter: 'control' },
					{ offset: null, parameter: 'pixel-fx-speed' }
				]
			}
		]
	},
	{
		maker: 'Tessary',
		model: 'Lantern Ball 40',
		notes: 'China-ball style soft source, 40 cm.',
		modes: [
			{
				name: 'Dimmer 16-bit',
				channels: [{ offset: 1, parameter: 'intensity', bits: 16, ...PCT }],
				inputVolts: { min: 12, max: 28 }
			},
			{
				name: 'CCT 8-bit',
				channels: [
					{ offset: 1, parameter: 'intensity', ...PCT },
					{ offset: 2, parameter: 'cct', ...CCT }
				]
			}
		]
	},
	{
		maker: 'Quayworks',
		model: 'Puck 8',
		notes: 'Palm-sized battery puck; RC input or per-parameter DMX addresses.',
		modes: [
			{
				name: 'HSI 8-bit',
				channels: [
					{ offset: 1, parameter: 'intensity', ...PCT },
					{ offset: 2, parameter: 'hue', ...HUE },
					{ offset: 3, parameter: 'saturation', ...PCT }
				]
			}
		]
	},
	{
		maker: 'Hollin & Vey',
		model: 'Deck Dimmer 4',
		notes: 'Four-way mains dimmer for practicals. Mains work by a qualified electrician only.',
		modes: [
			{
				name: '4 channel',
				channels: [
					{ offset: 1, parameter: 'intensity 1', ...PCT },
					{ offset: 2, parameter: 'intensity 2', ...PCT },
					{ offset: 3, parameter: 'intensity 3', ...PCT },
					{ offset: 4, parameter: 'intensity 4', ...PCT }
				]
			}
		]
	}
];

export async function ensureDemoUsers(database: Db): Promise<Map<string, string>> {
	const ids = new Map<string, string>();
	let hash: string | undefined;
	for (const u of DEMO_USERS) {
		const existing = database.select().from(users).where(eq(users.email, u.email)).get();
		if (existing) {
			ids.set(u.email, existing.id);
			continue;
		}
		hash ??= await hashPassword(DEMO_PASSWORD);
		const row = database
			.insert(users)
			.values({ email: u.email, name: u.name, passwordHash: hash, emailVerified: new Date() })
			.returning()
			.get();
		ids.set(u.email, row.id);
	}
	return ids;
}

/** True when the database holds no project at all: the only time the demo is seeded automatically. */
export function isEmpty(database: Db): boolean {
	return !database.select({ id: projects.id }).from(projects).limit(1).get();
}

/**
 * Seeds the demo project once. Running it again finds the project by name
 * and the demo owner, and changes nothing.
 */
export async function seedDemo(database: Db): Promise<{ projectId: number; created: boolean }> {
	const ids = await ensureDemoUsers(database);
	const existing = database
		.select({ id: projects.id })
		.from(projects)
		.innerJoin(memberships, eq(memberships.projectId, projects.id))
		.where(eq(projects.name, DEMO_PROJECT_NAME))
		.all()
		.find(() => true);
	if (existing) return { projectId: existing.id, created: false };

	const projectId = database.transaction((tx) => {
		const project = tx
			.insert(projects)
			.values({
				name: DEMO_PROJECT_NAME,
				venue: 'Moored ferry, north quay (invented)',
				startsOn: '2027-03-08',
				endsOn: '2027-03-19',
				notes: 'Night exteriors on the river. Battery units on deck; mains only from the quay distro.',
				artnetOffset: 1
			})
			.returning()
			.get();
		for (const u of DEMO_USERS) {
			tx.insert(memberships)
				.values({ projectId: project.id, userId: ids.get(u.email)!, role: u.role })
				.run();
		}

		const modeIds = new Map<string, { typeId: number; modeId: number }>();
		for (const t of TYPES) {
			const type = tx
				.insert(fixtureTypes)
				.values({ projectId: project.id, maker: t.maker, model: t.model, notes: t.notes })
				.returning()
				.get();
			t.modes.forEach((m, mi) => {
				const mode = tx
					.insert(modes)
					.values({
						typeId: type.id,
						name: m.name,
						position: mi,
						inputVoltsMin: m.inputVolts?.min ?? null,
						inputVoltsMax: m.inputVolts?.max ?? null
					})
					.returning()
					.get();
				m.channels.forEach((c, ci) => {
					tx.insert(modeChannels)
						.values({
							modeId: mode.id,
							position: ci,
							offset: c.offset,
							parameter: c.parameter,
							bits: c.bits ?? 8,
							defaultValue: c.default ?? 0,
							min: c.min ?? null,
							max: c.max ?? null,
							unit: c.unit ?? null
						})
						.run();
				});
				modeIds.set(`${t.model}/${m.name}`, { typeId: type.id, modeId: mode.id });
			});
		}

		const uni = (number: number, name: string, transport: (typeof universes.$inferInsert)['transport'], notes = '') =>
			tx.insert(universes).values({ projectId: project.id, number, name, transport, notes }).returning().get().id;
		const u1 = uni(1, 'Wheelhouse, wired', 'dmx-wired', 'Desk output A, 5-pin run along the rail');
		const u2 = uni(2, 'Main deck', 'sacn', 'Node on the mast, port 1');
		const u3 = uni(
			3,
			'Stern & river bank',
			'dmx-wireless',
			'Wireless transmitter on the roof, receivers on each bank stand'
		);
		const u4 = uni(4, 'Quay', 'artnet', 'Node in the quay distro box');

		const rx = tx
			.insert(receivers)
			.values({
				projectId: project.id,
				name: 'Tender boat rig',
				protocol: 'sbus',
				transmitterNotes: 'Handheld transmitter with the gaffer; model memory 3 "FERRY".'
			})
			.returning()
			.get();
		const labels: [number, string][] = [
			[1, 'right stick up/down'],
			[2, 'right stick left/right'],
			[3, 'left stick up/down'],
			[4, 'left stick left/right'],
			[5, 'knob S1'],
			[6, 'knob S2'],
			[7, 'slider LS'],
			[8, 'slider RS'],
			[17, 'switch SA (on/off)']
		];
		for (const [channel, label] of labels)
			tx.insert(receiverLabels).values({ receiverId: rx.id, channel, label }).run();

		let number = 100;
		const add = (
			key: string,
			label: string,
			control: Partial<typeof fixtures.$inferInsert>,
			extra: Partial<typeof fixtures.$inferInsert> = {}
		) => {
			const { typeId, modeId } = modeIds.get(key)!;
			number++;
			return tx
				.insert(fixtures)
				.values({ projectId: project.id, number, label, typeId, modeId, ...control, ...extra })
				.returning()
				.get().id;
		};
		const dmx = (universeId: number, address: number) => ({ controlKind: 'dmx' as const, universeId, address });

		// Universe 1: twelve 16-bit panels for the wheelhouse, then two balls
		const states = ['checked', 'checked', 'addressed', 'addressed', 'hung', 'planned'] as const;
		let leader = 0;
		for (let i = 0; i < 12; i++) {
			const id = add('Skiff Panel 60/HSIC 16-bit', `WHEEL ${i + 1}`, dmx(u1, 1 + i * 8), {
				position: i < 6 ? 'Wheelhouse ceiling, port' : 'Wheelhouse ceiling, starboard',
				groupName: 'Wheelhouse',
				state: states[i % states.length],
				watts: 90,
				lookHue: 30,
				lookSaturation: 20,
				lookIntensity: 60
			});
			if (i === 0) leader = id;
		}
		add('Lantern Ball 40/Dimmer 16-bit', 'WHEEL BALL A', dmx(u1, 97), {
			position: 'Over chart table',
			groupName: 'Wheelhouse',
			watts: 60,
			lookCct: 3200,
			lookIntensity: 40
		});
		add('Lantern Ball 40/Dimmer 16-bit', 'WHEEL BALL B', dmx(u1, 99), {
			position: 'Over helm',
			groupName: 'Wheelhouse',
			watts: 60,
			lookCct: 3200,
			lookIntensity: 40
		});
		// a second panel slaved to WHEEL 1 over its own link cable
		add(
			'Skiff Panel 60/HSIC 16-bit',
			'WHEEL 1 FOLLOW',
			{ controlKind: 'follow', leaderId: leader },
			{ position: 'Wheelhouse ceiling, port', groupName: 'Wheelhouse', watts: 90 }
		);

		// Universe 2: ten tubes in the 11-slot mode, on round-ish addresses
		for (let i = 0; i < 10; i++) {
			add('Reed Tube 120/HSIC 16-bit + FX', `DECK TUBE ${i + 1}`, dmx(u2, 1 + i * 20), {
				position: `Main deck rail ${i < 5 ? 'port' : 'starboard'} ${(i % 5) + 1}`,
				groupName: 'Deck',
				state: i < 4 ? 'hung' : 'planned',
				watts: 45,
				lookHue: 210,
				lookSaturation: 70,
				lookIntensity: 35
			});
		}
		add('Deck Dimmer 4/4 channel', 'PRACTICALS', dmx(u2, 301), {
			position: 'Saloon',
			groupName: 'Practicals',
			watts: 2400,
			notes: 'Mains from quay distro; RCD-protected.'
		});

		// Universe 3: six 8-bit panels, a three-tube link group, and a deliberate overlap
		for (let i = 0; i < 6; i++) {
			add('Skiff Panel 60/HSIC 8-bit', `STERN ${i + 1}`, dmx(u3, 1 + i * 4), {
				position: 'Stern rail',
				groupName: 'Stern',
				watts: 90,
				lookCct: 5600,
				lookIntensity: 70
			});
		}
		for (let i = 0; i < 3; i++) {
			add('Reed Tube 120/HSIC 8-bit', `BANK TUBE ${i + 1}`, dmx(u3, 41), {
				position: `River bank stand ${i + 1}`,
				groupName: 'Bank',
				linkGroup: 'BANK-CHAIN',
				watts: 45,
				lookHue: 200,
				lookSaturation: 90,
				lookIntensity: 50
			});
		}
		// starts on slot 23 while STERN 6 holds 21–24: the overlap the demo shows off
		add('Skiff Panel 60/HSIC 8-bit', 'STERN SPARE', dmx(u3, 23), {
			position: 'Stern, on the deck',
			groupName: 'Stern',
			watts: 90,
			notes: 'Re-address before call: overlaps STERN 6.'
		});

		// Universe 4: quay balls, and a puck with per-parameter addresses
		for (let i = 0; i < 4; i++) {
			add('Lantern Ball 40/CCT 8-bit', `QUAY BALL ${i + 1}`, dmx(u4, 1 + i * 2), {
				position: `Quay lamp post ${i + 1}`,
				groupName: 'Quay',
				watts: 60,
				lookCct: 2700,
				lookIntensity: 55
			});
		}
		add(
			'Puck 8/HSI 8-bit',
			'QUAY PUCK',
			{ controlKind: 'dmx-map', universeId: u4, addressMap: { intensity: 20, hue: 30, saturation: 31 } },
			{ position: 'Bollard 3', groupName: 'Quay', watts: 8 }
		);

		// Radio: pucks on the tender boat; two share channels as a link group
		add(
			'Puck 8/HSI 8-bit',
			'TENDER BOW',
			{ controlKind: 'rc', receiverId: rx.id, rcChannels: { intensity: 1, hue: 2, saturation: 3 } },
			{ position: 'Tender bow', groupName: 'Tender', watts: 8 }
		);
		add(
			'Puck 8/HSI 8-bit',
			'TENDER STERN',
			{ controlKind: 'rc', receiverId: rx.id, rcChannels: { intensity: 4, hue: 5, saturation: 6 } },
			{ position: 'Tender stern', groupName: 'Tender', watts: 8 }
		);
		for (const side of ['PORT', 'STBD']) {
			add(
				'Puck 8/HSI 8-bit',
				`TENDER ${side}`,
				{ controlKind: 'rc', receiverId: rx.id, rcChannels: { intensity: 7, hue: 8, saturation: 9 } },
				{ position: `Tender gunwale ${side.toLowerCase()}`, groupName: 'Tender', linkGroup: 'TENDER-SIDES', watts: 8 }
			);
		}
		add(
			'Lantern Ball 40/CCT 8-bit',
			'HAND LANTERN',
			{ controlKind: 'manual' },
			// no wattage on purpose: the Power page asks for one (no-power-data)
			{ position: 'Carried by cast', groupName: 'Props', notes: 'Set on the unit: 2700 K, 40 %.' }
		);

		seedPower(tx, project.id);

		return project.id;
	});
	return { projectId, created: true };
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

// Power for a night shoot (16:00 to 02:00): invented, generic packs and circuits chosen so the
// Power page shows each warning once and one battery shortfall.
function seedPower(tx: Tx, projectId: number): void {
	const pack = (values: Omit<typeof packTypes.$inferInsert, 'projectId'>) =>
		tx
			.insert(packTypes)
			.values({ projectId, ...values })
			.returning()
			.get().id;
	const circuit = (values: Omit<typeof circuits.$inferInsert, 'projectId'>) =>
		tx
			.insert(circuits)
			.values({ projectId, ...values })
			.returning()
			.get().id;
	const feed = (labels: string[], cols: { packTypeId?: number; circuitId?: number }) =>
		tx
			.update(fixtures)
			.set(cols)
			.where(and(eq(fixtures.projectId, projectId), inArray(fixtures.label, labels)))
			.run();
	const range = (prefix: string, n: number) => Array.from({ length: n }, (_, i) => `${prefix} ${i + 1}`);
	tx.update(projects).set({ dayStart: '16:00', dayWrap: '02:00' }).where(eq(projects.id, projectId)).run();

	// ten deck tubes on 98 Wh packs: the second swap round finds too few charged (a shortfall)
	const deck = pack({
		name: 'Deck 4-cell Li-ion 98 Wh',
		chemistry: 'li-ion',
		cells: 4,
		wattHours: 98,
		maxCurrentA: 10,
		onHand: 24,
		chargeHours: 3,
		chargers: 1,
		chargerBays: 4
	});
	feed(range('DECK TUBE', 10), { packTypeId: deck });
	const stern = pack({
		name: 'Stern 6-cell Li-ion 4.5 Ah',
		chemistry: 'li-ion',
		cells: 6,
		ampHours: 4.5,
		maxCurrentA: 8,
		onHand: 36,
		chargeHours: 2,
		chargers: 3,
		chargerBays: 4
	});
	feed(range('STERN', 6), { packTypeId: stern });
	// a small pack under a 90 W panel: more current than it gives (over-current)
	const spare = pack({
		name: 'Spare 4-cell LiPo 2.2 Ah',
		chemistry: 'lipo',
		cells: 4,
		ampHours: 2.2,
		maxCurrentA: 5,
		onHand: 40,
		chargeHours: 1,
		chargers: 2,
		chargerBays: 4
	});
	feed(['STERN SPARE'], { packTypeId: spare });
	// 8 cells reach 33.6 V charged, above the ball's 28 V input (voltage-range); 288 Wh (cargo only)
	const block = pack({
		name: 'Block 8-cell Li-ion 10 Ah',
		chemistry: 'li-ion',
		cells: 8,
		ampHours: 10,
		maxCurrentA: 20,
		onHand: 3,
		chargeHours: 6,
		chargers: 1,
		chargerBays: 1
	});
	feed(['WHEEL BALL A'], { packTypeId: block });
	// 150 Wh: flies only with the airline's approval
	const quay = pack({
		name: 'Quay 4-cell Li-ion 150 Wh',
		chemistry: 'li-ion',
		cells: 4,
		wattHours: 150,
		maxCurrentA: 12,
		onHand: 20,
		chargeHours: 3.5,
		chargers: 2,
		chargerBays: 4
	});
	feed(['WHEEL BALL B', ...range('QUAY BALL', 4), 'HAND LANTERN'], { packTypeId: quay });

	// 13 × 90 W on a 6 A breaker: 5.65 A, above 80 % (circuit-over-80)
	const wheel = circuit({ name: 'Wheelhouse ring (B6)', volts: 230, breakerA: 6, powerFactor: 0.9 });
	feed([...range('WHEEL', 12), 'WHEEL 1 FOLLOW'], { circuitId: wheel });
	// 2400 W on a 10 A breaker: 11.6 A, over the breaker (circuit-over-100)
	const saloon = circuit({ name: 'Saloon practicals (B10)', volts: 230, breakerA: 10, powerFactor: 0.9 });
	feed(['PRACTICALS'], { circuitId: saloon });
	const bank = circuit({ name: 'Quay distro, bank stands', volts: 230, breakerA: 16, powerFactor: 0.9 });
	feed(range('BANK TUBE', 3), { circuitId: bank });
}
