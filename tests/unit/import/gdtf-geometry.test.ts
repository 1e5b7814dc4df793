import { describe, expect, it } from 'vitest';
import { breakFootprints, channelOffsets } from '../../../src/lib/patch/index';
import { parseDmxValue, parseGdtf, parseGdtfXml } from '../../../src/lib/server/import/gdtf';
import {
	BAR_XML,
	fixtureXml,
	GDTF_FILES,
	gdtfZip,
	OFFSETS_XML,
	QUAD_XML,
	TWO_BREAK_XML,
	VALUES_XML
} from '../../helpers/gdtf';

// Sections named below are of DIN SPEC 15800:2022 (GDTF 1.2). Files are built in ../../helpers/gdtf.ts
// from the spec's structure with invented makers.

const mode = (xml: string, name: string) => parseGdtfXml(xml).type.modes.find((m) => m.name === name)!;
const footprint = (xml: string, name: string) =>
	breakFootprints({ id: 1, name, channels: mode(xml, name).channels }).map((b) => b.slots);

describe('GDTF DMXValue (attribute value types: "Uint/n" mirrors, "Uint/ns" shifts)', () => {
	it('255/1 in a 16-bit channel is 65535 (byte mirroring, the spec example)', () => {
		expect(parseDmxValue('255/1', 2)).toBe(65535);
	});
	it('255/1s in a 16-bit channel is 65280 (byte shifting, the spec example)', () => {
		expect(parseDmxValue('255/1s', 2)).toBe(65280);
	});
	it('mirroring repeats the written byte: 1/1 at 16 bits is 257, 128/1 at 24 bits is 0x808080 (repeat rule from memory)', () => {
		expect(parseDmxValue('1/1', 2)).toBe(257);
		expect(parseDmxValue('128/1', 3)).toBe(0x808080);
		expect(parseDmxValue('0/1', 2)).toBe(0);
	});
	it('a wider value narrows to its high bytes; a value too big for its byte count is no value', () => {
		expect(parseDmxValue('65535/2', 1)).toBe(255);
		expect(parseDmxValue('32768/2', 1)).toBe(128);
		expect(parseDmxValue('256/1', 1)).toBeNull();
	});
	it('defaults in a file: "255/1" at 16 bits → 65535, "255/1s" → 65280 (Channel Function Default)', () => {
		expect(mode(VALUES_XML, 'Mirror').channels[0]).toMatchObject({ parameter: 'intensity', bits: 16, default: 65535 });
		expect(mode(VALUES_XML, 'Shift').channels[0]).toMatchObject({ parameter: 'intensity', bits: 16, default: 65280 });
	});
});

describe('GDTF DMXChannel Offset: bytes most significant first, any order, any count', () => {
	it('"1" + "2,3,4,5" is a 32-bit channel: 5 slots', () => {
		const m = mode(OFFSETS_XML, 'Thirty-two');
		expect(m.channels[1]).toMatchObject({ parameter: 'Pan', offset: 2, bits: 32 });
		expect(footprint(OFFSETS_XML, 'Thirty-two')).toEqual([5]);
	});
	it('"2,1": coarse on 2, fine on 1 → 2 slots, byte order kept', () => {
		const ch = mode(OFFSETS_XML, 'Reversed').channels[0];
		expect(channelOffsets(ch)).toEqual([2, 1]);
		expect(footprint(OFFSETS_XML, 'Reversed')).toEqual([2]);
	});
	it('"2,9": fine on 9 → 9 slots', () => {
		expect(channelOffsets(mode(OFFSETS_XML, 'Apart').channels[0])).toEqual([2, 9]);
		expect(footprint(OFFSETS_XML, 'Apart')).toEqual([9]);
	});
	it('"1,3" with another channel on "2" is valid, not an overlap → 3 slots', () => {
		expect(footprint(OFFSETS_XML, 'Interleaved')).toEqual([3]);
	});
	it('more than 4 bytes is left out and named in the warnings', () => {
		const xml = fixtureXml('Five Byte', '<Geometry Name="Body"/>', [
			{
				name: 'Wide',
				geometry: 'Body',
				channels: [
					{ attribute: 'Dimmer', offset: '1', geometry: 'Body' },
					{ attribute: 'Pan', offset: '2,3,4,5,6', geometry: 'Body' }
				]
			}
		]);
		const r = parseGdtfXml(xml);
		expect(r.type.modes[0].channels.map((c) => c.parameter)).toEqual(['intensity']);
		expect(r.warnings.join('\n')).toMatch(/Mode "Wide": Pan .*5 bytes/);
	});
});

describe('GDTF Channel Function: DMXFrom sub-range and physical direction', () => {
	it('CTC 10000 → 2000 K over DMX 0–199 keeps both the direction and the sub-range', () => {
		expect(mode(VALUES_XML, 'Mirror').channels[1]).toMatchObject({
			parameter: 'cct',
			min: 10000,
			max: 2000,
			unit: 'K',
			dmxFrom: 0,
			dmxTo: 199
		});
	});
});

describe('GDTF geometry tree: GeometryReference and its Break (Geometry Reference, DMX Channel DMXBreak)', () => {
	it('a 12-cell RGBW bar repeats the cell channels at each Break DMXOffset: 48 slots, no warning', () => {
		const r = parseGdtfXml(BAR_XML);
		const m = r.type.modes[0];
		expect(m.channels).toHaveLength(48);
		expect(m.channels.slice(0, 5).map((c) => [c.parameter, c.offset])).toEqual([
			['red', 1],
			['red 2', 5],
			['red 3', 9],
			['red 4', 13],
			['red 5', 17]
		]);
		expect(m.channels.find((c) => c.parameter === 'white 12')?.offset).toBe(48);
		expect(footprint(BAR_XML, 'Pixel RGBW')).toEqual([48]);
		expect(r.warnings).toEqual([]);
	});
	it('DMXBreak="Overwrite" channels take break and offset from the reference: four heads → 4 slots', () => {
		const m = mode(QUAD_XML, 'Heads');
		expect(m.channels.map((c) => [c.parameter, c.offset, c.dmxBreak ?? 1])).toEqual([
			['intensity', 1, 1],
			['intensity 2', 2, 1],
			['intensity 3', 3, 1],
			['intensity 4', 4, 1]
		]);
		expect(footprint(QUAD_XML, 'Heads')).toEqual([4]);
	});
	it('an Overwrite reference whose last Break names break 2 puts the channel on break 2', () => {
		const xml = QUAD_XML.replace('<Break DMXBreak="1" DMXOffset="4"/>', '<Break DMXBreak="2" DMXOffset="7"/>');
		expect(footprint(xml, 'Heads')).toEqual([3, 7]);
	});
	it('a reference without a Break for the channel break is listed by name, not dropped silently', () => {
		const xml = BAR_XML.replace(
			'<GeometryReference Name="Cell 12" Geometry="Cell"><Break DMXBreak="1" DMXOffset="45"/>',
			'<GeometryReference Name="Cell 12" Geometry="Cell"><Break DMXBreak="3" DMXOffset="45"/>'
		);
		const r = parseGdtfXml(xml);
		expect(r.type.modes[0].channels).toHaveLength(44);
		expect(r.warnings.filter((w) => w.includes('reference Cell 12'))).toHaveLength(4);
	});
});

describe('GDTF DMX breaks: a mode spans several', () => {
	it('a two-break mode keeps the second break: 6 slots on break 1, 4 on break 2', () => {
		const r = parseGdtfXml(TWO_BREAK_XML);
		expect(r.warnings).toEqual([]);
		expect(r.type.modes[0].channels.map((c) => [c.parameter, c.offset, c.dmxBreak ?? 1])).toEqual([
			['intensity', 1, 1],
			['red', 6, 1],
			['green', 1, 2],
			['blue', 4, 2]
		]);
		expect(footprint(TWO_BREAK_XML, 'Split')).toEqual([6, 4]);
	});
});

describe('every GDTF test file re-imported from its .gdtf archive gives its footprints', () => {
	for (const file of GDTF_FILES) {
		it(file.name, () => {
			const { type } = parseGdtf(gdtfZip(file.xml));
			const got = Object.fromEntries(
				type.modes.map((m) => [
					m.name,
					breakFootprints({ id: 1, name: m.name, channels: m.channels }).map((b) => b.slots)
				])
			);
			expect(got).toEqual(file.footprints);
		});
	}
});
