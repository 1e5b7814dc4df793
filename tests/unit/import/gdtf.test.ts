import { describe, expect, it } from 'vitest';
import { modeSlotCount } from '../../../src/lib/patch/index';
import { refusal } from '../../helpers/refusal';
import { parameterFor, parseDmxValue, parseGdtf, parseGdtfXml } from '../../../src/lib/server/import/gdtf';
import { gdtfZip, PANEL_XML } from '../../helpers/gdtf';

describe('GDTF fixture types (DIN SPEC 15800 structure)', () => {
	const { type, dataVersion } = parseGdtf(gdtfZip());
	const mode = (name: string) => type.modes.find((m) => m.name === name)!;

	it('reads maker from Manufacturer, model from LongName, one mode per DMXMode', () => {
		expect(type.maker).toBe('Harbourlight Works');
		expect(type.model).toBe('Tidepanel One');
		expect(type.notes).toContain('An invented soft panel.');
		expect(type.modes.map((m) => m.name)).toEqual(['Basic 8', 'HSI 16', 'Cells']);
		expect(dataVersion).toBe('1.1');
	});

	it('a virtual channel (empty or missing Offset) takes no slot (DESIGN "Mode")', () => {
		const basic = mode('Basic 8');
		expect(basic.channels.map((c) => [c.parameter, c.offset, c.bits])).toEqual([
			['intensity', 1, 8],
			['cct', 2, 8],
			['fan', null, 8]
		]);
		expect(modeSlotCount({ id: 1, name: 'Basic 8', channels: basic.channels })).toBe(2);
	});

	it('16-bit offsets "1,2" give 2 slots and the gap up to the channel at 5 still belongs to the footprint: 5 slots', () => {
		const hsi = mode('HSI 16');
		expect(hsi.channels[0]).toMatchObject({ parameter: 'intensity', offset: 1, bits: 16 });
		expect(hsi.channels[1]).toMatchObject({ parameter: 'hue', offset: 5, bits: 8, min: 0, max: 360, unit: '°' });
		expect(hsi.channels[2]).toMatchObject({ parameter: 'control', offset: null });
		expect(modeSlotCount({ id: 2, name: 'HSI 16', channels: hsi.channels })).toBe(5);
	});

	it('defaults come from "value/bytes" (GDTF DMXValue); CTC carries its kelvin range', () => {
		expect(mode('HSI 16').channels[0].default).toBe(32768);
		expect(mode('Basic 8').channels[1]).toMatchObject({ default: 128, min: 2800, max: 10000, unit: 'K' });
	});

	it('multi-instance geometries repeating an attribute are suffixed; 24-bit from three offsets', () => {
		const cells = mode('Cells');
		expect(cells.channels.map((c) => c.parameter)).toEqual(['intensity', 'intensity 2', 'intensity 3', 'red']);
		expect(cells.channels[0].bits).toBe(24);
		// "255/1" on a 3-byte channel: byte mirroring fills every byte, 0xFFFFFF (GDTF DMXValue, DIN SPEC 15800)
		expect(cells.channels[0].default).toBe(2 ** 24 - 1);
		expect(modeSlotCount({ id: 3, name: 'Cells', channels: cells.channels })).toBe(6);
	});

	it('maps the GDTF attribute names the brief lists and keeps the others', () => {
		expect(parameterFor('Dimmer')).toBe('intensity');
		expect(parameterFor('HSB_Saturation')).toBe('saturation');
		expect(parameterFor('CTO')).toBe('cct');
		expect(parameterFor('ColorAdd_W')).toBe('white');
		expect(parameterFor('StrobeFrequency')).toBe('strobe');
		expect(parameterFor('Pan')).toBe('Pan');
	});

	it('parses DMX values: plain numbers at the channel resolution, value/bytes mirrored up, narrowed to high bytes', () => {
		expect(parseDmxValue('128', 1)).toBe(128);
		// GDTF DMXValue: "1/1" is stretched by byte mirroring, 0x0101 (DIN SPEC 15800 attribute value types)
		expect(parseDmxValue('1/1', 2)).toBe(257);
		expect(parseDmxValue('65535/2', 1)).toBe(255);
		expect(parseDmxValue('', 1)).toBeNull();
		expect(parseDmxValue('abc', 1)).toBeNull();
	});

	it('falls back to Name when LongName is missing, and accepts DataVersion 1.0 and 1.2', () => {
		const v10 = parseGdtfXml(
			PANEL_XML.replace('DataVersion="1.1"', 'DataVersion="1.0"').replace(' LongName="Tidepanel One"', '')
		);
		expect(v10.type.model).toBe('Tidepanel');
		expect(v10.warnings).toEqual([]);
		expect(parseGdtfXml(PANEL_XML.replace('DataVersion="1.1"', 'DataVersion="1.2"')).warnings).toEqual([]);
	});

	it('refuses a DOCTYPE or entity declaration before parsing', () => {
		const bomb = `<?xml version="1.0"?><!DOCTYPE lolz [<!ENTITY lol "lol"><!ENTITY lol2 "&lol;&lol;">]><GDTF><FixtureType Name="&lol2;"/></GDTF>`;
		expect(refusal(() => parseGdtfXml(bomb)).extra.code).toBe('xml-dtd');
		expect(refusal(() => parseGdtfXml('<GDTF><!ENTITY x SYSTEM "file:///etc/passwd"></GDTF>')).extra.code).toBe(
			'xml-dtd'
		);
	});

	it("refuses overlapping channels with the type schema's own message, naming the mode", () => {
		const bad = PANEL_XML.replace('Offset="5" Geometry="Base"', 'Offset="2" Geometry="Base"');
		const e = refusal(() => parseGdtfXml(bad));
		expect(e.status).toBe(422);
		expect(e.message).toContain('Mode "HSI 16"');
		expect(e.message).toContain('both claim slot 2');
	});

	it('refuses an archive without description.xml and XML without FixtureType', () => {
		expect(refusal(() => parseGdtf(gdtfZip('<x/>'))).message).toContain('FixtureType');
		const e = refusal(() =>
			parseGdtfXml('<GDTF><FixtureType Manufacturer="M" Name="N"><DMXModes/></FixtureType></GDTF>')
		);
		expect(e.message).toContain('at least one mode');
	});
});
