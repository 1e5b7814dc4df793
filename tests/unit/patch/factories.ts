import type { Bits, FixtureControl, Mode, ModeChannel, PatchFixture, Universe } from '../../../src/lib/patch';

export function channel(offset: number | null, parameter: string, bits: Bits = 8): ModeChannel {
	return { offset, parameter, bits, default: 0 };
}

/** A mode of `n` 8-bit channels at offsets 1…n. */
export function plainMode(id: number, n: number): Mode {
	return { id, name: `${n}ch`, channels: Array.from({ length: n }, (_, i) => channel(i + 1, `p${i + 1}`)) };
}

export function universe(id: number, number = id, transport: Universe['transport'] = 'sacn'): Universe {
	return { id, number, transport };
}

let nextId = 1;

export function fixture(control: FixtureControl, over: Partial<PatchFixture> = {}): PatchFixture {
	const id = over.id ?? nextId++;
	return { id, number: id, label: `FX ${id}`, typeId: 1, modeId: 1, linkGroup: null, control, ...over };
}

export function dmx(universeId: number, address: number, over: Partial<PatchFixture> = {}): PatchFixture {
	return fixture({ kind: 'dmx', universeId, address }, over);
}
