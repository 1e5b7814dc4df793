// Patch-engine benches: conflicts over a big patch, and auto-addressing a big batch.
import {
	autoAddressAcross,
	findConflicts,
	type AutoAddressFixture,
	type Mode,
	type ModeChannel,
	type PatchFixture,
	type Universe
} from '../../src/lib/patch';
import { bench, benchAgainst, seeded, type BenchLine, type BenchModule } from './harness';

const ch = (offset: number | null, parameter: string, bits: 8 | 16 = 8): ModeChannel => ({
	offset,
	parameter,
	bits,
	default: 0
});

// Modes a colour-LED rig really mixes: 1-slot dimmers up to a 12-slot 16-bit mode with a gap.
const MODES: Mode[] = [
	{ id: 1, name: '1ch', channels: [ch(1, 'intensity')] },
	{ id: 2, name: 'HSI 8-bit', channels: [ch(1, 'intensity'), ch(2, 'hue'), ch(3, 'saturation')] },
	{ id: 3, name: 'CCT 16-bit', channels: [ch(1, 'intensity', 16), ch(3, 'cct', 16)] },
	{
		id: 4,
		name: 'HSIC gap',
		channels: [ch(1, 'intensity', 16), ch(3, 'hue'), ch(4, 'saturation'), ch(6, 'cct'), ch(null, 'fan')]
	},
	{
		id: 5,
		name: 'RGBW 16-bit',
		channels: [ch(1, 'red', 16), ch(3, 'green', 16), ch(5, 'blue', 16), ch(7, 'white', 16)]
	},
	{
		id: 6,
		name: 'full',
		channels: [
			ch(1, 'intensity', 16),
			ch(3, 'hue', 16),
			ch(5, 'saturation'),
			ch(6, 'cct', 16),
			ch(8, 'strobe'),
			ch(12, 'control')
		]
	}
];
const SIZES = [1, 3, 4, 6, 8, 12];
// dmx-map fixtures: three parameters spread over a 7-slot window.
const MAP_MODE: Mode = { id: 7, name: 'map', channels: [ch(1, 'intensity', 16), ch(3, 'hue'), ch(4, 'cct')] };

interface Patch {
	universes: Universe[];
	modes: Mode[];
	fixtures: PatchFixture[];
	/** The same slot runs, for the plain-sort baseline. */
	ranges: { universe: number; start: number; end: number }[];
}

export function makePatch(fixtureCount: number, universeCount: number): Patch {
	const rand = seeded(20240601);
	const universes: Universe[] = Array.from({ length: universeCount }, (_, i) => ({
		id: i + 1,
		number: i + 1,
		transport: i % 8 === 0 ? 'dmx-wired' : 'sacn'
	}));
	const fixtures: PatchFixture[] = [];
	const ranges: Patch['ranges'] = [];
	for (let u = 1; u <= universeCount; u++) {
		const want = Math.floor((fixtureCount * u) / universeCount) - Math.floor((fixtureCount * (u - 1)) / universeCount);
		let cursor = 1;
		let linked = 0;
		for (let k = 0; k < want; k++) {
			const id = fixtures.length + 1;
			const roll = rand();
			const prev = fixtures[fixtures.length - 1];
			if (linked > 0 && prev !== undefined) {
				// Part of a link group: same universe, address and mode as the one before.
				fixtures.push({ ...prev, id, number: id, label: `FX ${id}` });
				linked--;
				const c = prev.control;
				if (c.kind === 'dmx')
					ranges.push({ universe: u, start: c.address, end: c.address + (SIZES[prev.modeId - 1] ?? 1) - 1 });
				continue;
			}
			if (roll < 0.1 && cursor + 6 <= 512) {
				const addresses = { intensity: cursor, hue: cursor + 4, cct: cursor + 6 };
				fixtures.push({
					id,
					number: id,
					label: `FX ${id}`,
					typeId: 7,
					modeId: 7,
					linkGroup: null,
					control: { kind: 'dmx-map', universeId: u, addresses }
				});
				ranges.push(
					{ universe: u, start: cursor, end: cursor + 1 },
					{ universe: u, start: cursor + 4, end: cursor + 4 },
					{ universe: u, start: cursor + 6, end: cursor + 6 }
				);
				cursor += 7;
				continue;
			}
			let m = Math.floor(rand() * MODES.length);
			while (m > 0 && cursor + (SIZES[m] as number) - 1 > 512) m--;
			const size = SIZES[m] as number;
			// A few mistakes: 0.5 % start one slot early and overlap their neighbour.
			const address = roll > 0.995 && cursor > 1 ? cursor - 1 : cursor;
			const group = roll > 0.97 && roll <= 0.995 ? `G${id}` : null;
			if (group !== null) linked = 1 + Math.floor(rand() * 3);
			fixtures.push({
				id,
				number: id,
				label: `FX ${id}`,
				typeId: m + 1,
				modeId: m + 1,
				linkGroup: group,
				control: { kind: 'dmx', universeId: u, address }
			});
			ranges.push({ universe: u, start: address, end: address + size - 1 });
			cursor = Math.min(address + size, 512);
		}
	}
	// Input arrives in no useful order (ids, numbers and addresses unrelated), as from a database.
	const order = fixtures.map((_, i) => i);
	for (let i = order.length - 1; i > 0; i--) {
		const j = Math.floor(rand() * (i + 1));
		[order[i], order[j]] = [order[j] as number, order[i] as number];
	}
	const shuffled = order.map((i, n) => ({ ...(fixtures[i] as PatchFixture), number: n + 1 }));
	const shuffledRanges = [...ranges];
	for (let i = shuffledRanges.length - 1; i > 0; i--) {
		const j = Math.floor(rand() * (i + 1));
		[shuffledRanges[i], shuffledRanges[j]] = [
			shuffledRanges[j] as Patch['ranges'][number],
			shuffledRanges[i] as Patch['ranges'][number]
		];
	}
	return { universes, modes: [...MODES, MAP_MODE], fixtures: shuffled, ranges: shuffledRanges };
}

async function conflicts20k(): Promise<BenchLine> {
	const patch = makePatch(20_000, 256);
	const found = findConflicts(patch);
	if (!found.some((c) => c.kind === 'overlap') || !found.some((c) => c.kind === 'linked')) {
		throw new Error('bench patch should contain overlaps and link groups');
	}
	const r = await benchAgainst(
		() => findConflicts(patch),
		() => patch.ranges.slice().sort((a, b) => a.universe - b.universe || a.start - b.start),
		{ runs: 21, warmup: 10 }
	);
	return { name: 'conflicts-20k', value: r.subject, unit: 'ms', ratio: r.ratio };
}

async function autopatch10k(): Promise<BenchLine> {
	const sizes = [1, 3, 4, 6, 8, 12, 16, 24];
	const fixtures: AutoAddressFixture[] = Array.from({ length: 10_000 }, (_, i) => ({
		id: i + 1,
		number: 10_000 - i,
		slots: sizes[i % sizes.length] as number
	}));
	const universes = Array.from({ length: 250 }, (_, i) => ({ universeId: i + 1 }));
	const check = autoAddressAcross({ fixtures, universes });
	if (check.unplaced.length > 0) throw new Error(`${check.unplaced.length} fixtures did not fit`);
	const r = await bench('autopatch-10k', () => autoAddressAcross({ fixtures, universes }), { runs: 15, warmup: 5 });
	return { name: 'autopatch-10k', value: r.median, unit: 'ms', ratio: r.median / 100 };
}

const BENCHES: Record<string, () => Promise<BenchLine>> = {
	'conflicts-20k': conflicts20k,
	'autopatch-10k': autopatch10k
};

export const engine: BenchModule = {
	name: 'engine',
	benches: Object.keys(BENCHES),
	async run({ filter } = {}) {
		const lines: BenchLine[] = [];
		for (const [name, fn] of Object.entries(BENCHES))
			if (filter === undefined || name.includes(filter)) lines.push(await fn());
		return lines;
	}
};
