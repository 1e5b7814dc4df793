import { describe, expect, it } from 'vitest';
import { typeCreate, typePatch } from '../../../src/lib/schemas/type';
import { TypeDraft } from '../../../src/routes/projects/[id=int]/types/type-draft.svelte';
import type { TypeShape } from '../../../src/lib/shapes';

// The types page's editor state. Slot arithmetic: one DMX slot per byte (ANSI E1.11), a 16-bit
// channel is coarse + fine on two adjacent slots (common practice); GDTF fields (DIN SPEC 15800
// DMXFrom/DMXTo/DMXBreak, split offsets) must survive an edit they were not part of.

const saved: TypeShape = {
	id: 7,
	maker: 'Testworks',
	model: 'Tube',
	notes: 'n',
	drawFloor: 0.15,
	version: 3,
	modes: [
		{
			id: 70,
			name: 'HSI 16',
			slots: 5,
			watts: 48,
			inputVolts: { min: 12, max: 48 },
			channels: [
				{ offset: 1, parameter: 'intensity', bits: 16, default: 0 },
				{ offset: 3, parameter: 'hue', bits: 16, default: 0, min: 0, max: 360, unit: '°', dmxFrom: 0, dmxTo: 65535 },
				{ offset: 5, parameter: 'saturation', bits: 8, default: 0 },
				{ offset: null, parameter: 'virtual', bits: 8, default: 0 }
			]
		},
		{
			id: 71,
			name: 'split',
			slots: 9,
			channels: [{ offset: 2, parameter: 'cct', bits: 16, default: 0, fineOffsets: [9], dmxBreak: 1 }]
		}
	]
};

describe('TypeDraft', () => {
	it('round-trips a saved type into a patch the API schema accepts, hidden fields untouched', () => {
		const d = new TypeDraft(saved);
		const body = d.body();
		const parsed = typePatch.parse(body);
		expect(parsed.version).toBe(3);
		expect(parsed.drawFloor).toBeCloseTo(0.15);
		expect(parsed.modes?.[0]).toMatchObject({ id: 70, watts: 48, inputVolts: { min: 12, max: 48 } });
		expect(parsed.modes?.[0].channels[1]).toMatchObject({ dmxFrom: 0, dmxTo: 65535, min: 0, max: 360, unit: '°' });
		expect(parsed.modes?.[1].channels[0].fineOffsets).toEqual([9]);
		expect(parsed.modes?.[0].channels[3].offset).toBeNull();
	});

	it('counts slots and draws the layout as typed (16-bit = coarse + fine)', () => {
		const d = new TypeDraft(saved);
		expect(d.slots(0)).toBe(5);
		expect(d.layout(0)).toEqual(['intensity', 'intensity·fine', 'hue', 'hue·fine', 'saturation']);
		d.modes[0].channels[2].offset = '8';
		expect(d.slots(0)).toBe(8);
		expect(d.layout(0)[5]).toBe('');
		d.modes[0].channels[2].offset = 'x';
		expect(typeof d.slots(0)).toBe('string');
		expect(d.layout(0)).toEqual([]);
		// a split 16-bit channel: coarse on 2, fine on 9
		expect(d.layout(1)[1]).toBe('cct');
		expect(d.layout(1)[8]).toBe('cct·fine');
	});

	it('moving a channel up trades places in the slot layout when the two are adjacent', () => {
		const d = new TypeDraft(saved);
		d.moveChannel(0, 2, -1); // saturation (8-bit, slot 5) above hue (16-bit, slots 3–4)
		const ch = d.modes[0].channels;
		expect(ch.map((c) => c.parameter)).toEqual(['intensity', 'saturation', 'hue', 'virtual']);
		expect(ch.map((c) => c.offset)).toEqual(['1', '3', '4', '']);
		expect(d.slots(0)).toBe(5);
		d.moveChannel(0, 1, 1); // and back
		expect(d.modes[0].channels.map((c) => [c.parameter, c.offset])).toEqual([
			['intensity', '1'],
			['hue', '3'],
			['saturation', '5'],
			['virtual', '']
		]);
		// a virtual channel only changes place
		d.moveChannel(0, 3, -1);
		expect(d.modes[0].channels.map((c) => [c.parameter, c.offset]).slice(2)).toEqual([
			['virtual', ''],
			['saturation', '5']
		]);
		// the ends do not move further
		d.moveChannel(0, 0, -1);
		expect(d.modes[0].channels[0].parameter).toBe('intensity');
	});

	it('adds channels after the footprint with a parameter not yet used', () => {
		const d = new TypeDraft();
		d.addChannel(0);
		expect(d.modes[0].channels.map((c) => [c.parameter, c.offset])).toEqual([
			['intensity', '1'],
			['parameter 2', '2']
		]);
	});

	it('duplicates a mode unsaved (no id) with its own copy of the channels', () => {
		const d = new TypeDraft(saved);
		d.duplicateMode(0);
		d.duplicateMode(0);
		expect(d.modes.map((m) => m.name)).toEqual(['HSI 16', 'HSI 16 copy 2', 'HSI 16 copy', 'split']);
		expect(d.modes[1].id).toBeUndefined();
		d.modes[1].channels[0].parameter = 'changed';
		expect(d.modes[0].channels[0].parameter).toBe('intensity');
		expect(typePatch.safeParse(d.body()).success).toBe(true);
	});

	it('a new type sends no ids or version and passes typeCreate once named', () => {
		const d = new TypeDraft();
		expect(typeCreate.safeParse(d.body()).success).toBe(false);
		d.maker = 'Maker';
		d.model = 'Model';
		d.modes[0].name = '1ch';
		const body = d.body();
		expect(body).not.toHaveProperty('version');
		expect(typeCreate.safeParse(body).success).toBe(true);
		d.clear();
		expect(d.maker).toBe('');
		expect(d.modes).toHaveLength(1);
	});
});
