import { strToU8, zipSync } from 'fflate';
import { crc32, deflateRawSync } from 'node:zlib';

// An invented fixture built from the published GDTF structure (DIN SPEC 15800):
// description.xml → GDTF → FixtureType → DMXModes → DMXMode → DMXChannels →
// DMXChannel → LogicalChannel → ChannelFunction.

export const PANEL_XML = `<?xml version="1.0" encoding="UTF-8" standalone="no" ?>
<GDTF DataVersion="1.1">
  <FixtureType Name="Tidepanel" ShortName="TP1" LongName="Tidepanel One" Manufacturer="Harbourlight Works" Description="An invented soft panel." FixtureTypeID="00000000-0000-0000-0000-000000000001">
    <AttributeDefinitions/>
    <Geometries><Geometry Name="Base"/></Geometries>
    <DMXModes>
      <DMXMode Name="Basic 8" Geometry="Base">
        <DMXChannels>
          <DMXChannel DMXBreak="1" Offset="1" InitialFunction="Base_Dimmer.Dimmer.Dimmer" Geometry="Base">
            <LogicalChannel Attribute="Dimmer">
              <ChannelFunction Name="Dimmer" Attribute="Dimmer" DMXFrom="0/1" Default="0/1" PhysicalFrom="0" PhysicalTo="1"/>
            </LogicalChannel>
          </DMXChannel>
          <DMXChannel DMXBreak="1" Offset="2" Geometry="Base">
            <LogicalChannel Attribute="CTC">
              <ChannelFunction Name="CTC" Attribute="CTC" DMXFrom="0/1" Default="128/1" PhysicalFrom="2800" PhysicalTo="10000"/>
            </LogicalChannel>
          </DMXChannel>
          <DMXChannel DMXBreak="1" Offset="" Geometry="Base">
            <LogicalChannel Attribute="Fans">
              <ChannelFunction Name="Fans" Attribute="Fans" DMXFrom="0/1" Default="0/1"/>
            </LogicalChannel>
          </DMXChannel>
        </DMXChannels>
      </DMXMode>
      <DMXMode Name="HSI 16" Geometry="Base">
        <DMXChannels>
          <DMXChannel DMXBreak="1" Offset="1,2" Geometry="Base">
            <LogicalChannel Attribute="Dimmer">
              <ChannelFunction Name="Dimmer" Attribute="Dimmer" DMXFrom="0/2" Default="32768/2"/>
            </LogicalChannel>
          </DMXChannel>
          <DMXChannel DMXBreak="1" Offset="5" Geometry="Base">
            <LogicalChannel Attribute="HSB_Hue">
              <ChannelFunction Name="Hue" Attribute="HSB_Hue" DMXFrom="0/1" Default="0/1" PhysicalFrom="0" PhysicalTo="360"/>
            </LogicalChannel>
          </DMXChannel>
          <DMXChannel DMXBreak="1" Geometry="Base">
            <LogicalChannel Attribute="Control1"><ChannelFunction Name="Reset" Default="0/1"/></LogicalChannel>
          </DMXChannel>
        </DMXChannels>
      </DMXMode>
      <DMXMode Name="Cells" Geometry="Base">
        <DMXChannels>
          <DMXChannel DMXBreak="1" Offset="1,2,3" Geometry="Cell1">
            <LogicalChannel Attribute="Dimmer"><ChannelFunction Name="Dimmer" Default="255/1"/></LogicalChannel>
          </DMXChannel>
          <DMXChannel DMXBreak="1" Offset="4" Geometry="Cell2">
            <LogicalChannel Attribute="Dimmer"><ChannelFunction Name="Dimmer" Default="0/1"/></LogicalChannel>
          </DMXChannel>
          <DMXChannel DMXBreak="1" Offset="5" Geometry="Cell3">
            <LogicalChannel Attribute="Dimmer"><ChannelFunction Name="Dimmer" Default="0/1"/></LogicalChannel>
          </DMXChannel>
          <DMXChannel DMXBreak="1" Offset="6" Geometry="Cell1">
            <LogicalChannel Attribute="ColorAdd_R"><ChannelFunction Name="Red" Default="0/1"/></LogicalChannel>
          </DMXChannel>
        </DMXChannels>
      </DMXMode>
    </DMXModes>
  </FixtureType>
</GDTF>`;

export function gdtfZip(xml = PANEL_XML, extra: Record<string, Uint8Array> = {}): Uint8Array {
	return zipSync({ 'description.xml': strToU8(xml), ...extra });
}

/** A one-entry zip of `size` zero bytes, deflated by zlib (fast) and framed by hand (PKWARE APPNOTE.TXT 4.3). */
export function zeroBomb(name: string, size: number): Uint8Array {
	const data = deflateRawSync(Buffer.alloc(size), { level: 1 });
	const crc = crc32(Buffer.alloc(size));
	const nameBytes = Buffer.from(name);
	const local = Buffer.alloc(30);
	local.writeUInt32LE(0x04034b50, 0);
	local.writeUInt16LE(20, 4);
	local.writeUInt16LE(8, 8);
	local.writeUInt32LE(crc, 14);
	local.writeUInt32LE(data.length, 18);
	local.writeUInt32LE(size, 22);
	local.writeUInt16LE(nameBytes.length, 26);
	const central = Buffer.alloc(46);
	central.writeUInt32LE(0x02014b50, 0);
	central.writeUInt16LE(20, 4);
	central.writeUInt16LE(20, 6);
	central.writeUInt16LE(8, 10);
	central.writeUInt32LE(crc, 16);
	central.writeUInt32LE(data.length, 20);
	central.writeUInt32LE(size, 24);
	central.writeUInt16LE(nameBytes.length, 28);
	const cdOffset = local.length + nameBytes.length + data.length;
	const end = Buffer.alloc(22);
	end.writeUInt32LE(0x06054b50, 0);
	end.writeUInt16LE(1, 8);
	end.writeUInt16LE(1, 10);
	end.writeUInt32LE(central.length + nameBytes.length, 12);
	end.writeUInt32LE(cdOffset, 16);
	return new Uint8Array(Buffer.concat([local, nameBytes, data, central, nameBytes, end]));
}

// ---- description.xml built from the DIN SPEC 15800 structure, for the geometry and value cases ----

export interface ChannelSpec {
	attribute: string;
	offset: string;
	geometry: string;
	/** DMXBreak attribute: "1" (default), "2", "Overwrite". */
	dmxBreak?: string;
	/** ChannelFunction elements; one plain function when absent. */
	functions?: { dmxFrom?: string; default?: string; physicalFrom?: number; physicalTo?: number }[];
	initialDefault?: string;
}

export function channelXml(c: ChannelSpec): string {
	const fns = (c.functions ?? [{ dmxFrom: '0/1', default: c.initialDefault ?? '0/1' }])
		.map(
			(f, i) =>
				`<ChannelFunction Name="F${i + 1}" Attribute="${c.attribute}" DMXFrom="${f.dmxFrom ?? '0/1'}" Default="${f.default ?? '0/1'}"${f.physicalFrom === undefined ? '' : ` PhysicalFrom="${f.physicalFrom}" PhysicalTo="${f.physicalTo}"`}/>`
		)
		.join('');
	return `<DMXChannel DMXBreak="${c.dmxBreak ?? '1'}" Offset="${c.offset}" InitialFunction="${c.geometry}_${c.attribute}.${c.attribute}.F1" Geometry="${c.geometry}"><LogicalChannel Attribute="${c.attribute}">${fns}</LogicalChannel></DMXChannel>`;
}

/** A whole description.xml: an invented maker, the given geometries and modes. */
export function fixtureXml(
	model: string,
	geometries: string,
	modes: { name: string; geometry: string; channels: ChannelSpec[] }[]
): string {
	const modeXml = modes
		.map(
			(m) =>
				`<DMXMode Name="${m.name}" Geometry="${m.geometry}"><DMXChannels>${m.channels.map(channelXml).join('')}</DMXChannels></DMXMode>`
		)
		.join('');
	return `<?xml version="1.0" encoding="UTF-8"?>
<GDTF DataVersion="1.2"><FixtureType Name="${model}" LongName="${model}" Manufacturer="Ferncastle Lampworks" FixtureTypeID="00000000-0000-0000-0000-00000000000${model.length % 10}"><AttributeDefinitions/><Geometries>${geometries}</Geometries><DMXModes>${modeXml}</DMXModes></FixtureType></GDTF>`;
}

const RGBW = ['ColorAdd_R', 'ColorAdd_G', 'ColorAdd_B', 'ColorAdd_W'];

/**
 * 12-cell RGBW bar: a top-level "Cell" geometry with four channels at offsets 1–4, repeated by 12
 * GeometryReferences in the body with Break DMXBreak=1 DMXOffset 1, 5, 9 … 45 → 48 slots.
 */
export const BAR_XML = fixtureXml(
	'Lathe Bar 12',
	`<Geometry Name="Body">${Array.from({ length: 12 }, (_, i) => `<GeometryReference Name="Cell ${i + 1}" Geometry="Cell"><Break DMXBreak="1" DMXOffset="${1 + 4 * i}"/></GeometryReference>`).join('')}</Geometry><Geometry Name="Cell"><Beam Name="Cell Beam"/></Geometry>`,
	[
		{
			name: 'Pixel RGBW',
			geometry: 'Body',
			channels: RGBW.map((a, i) => ({ attribute: a, offset: `${i + 1}`, geometry: 'Cell Beam' }))
		}
	]
);

/**
 * Four-head unit: the "Head" geometry's dimmer has DMXBreak="Overwrite" at offset 1; four references
 * put it at offsets 1–4 through their (last) Break → 4 slots.
 */
export const QUAD_XML = fixtureXml(
	'Clover Four',
	`<Geometry Name="Body">${[1, 2, 3, 4].map((i) => `<GeometryReference Name="Head ${i}" Geometry="Head"><Break DMXBreak="1" DMXOffset="${i}"/></GeometryReference>`).join('')}</Geometry><Geometry Name="Head"/>`,
	[
		{
			name: 'Heads',
			geometry: 'Body',
			channels: [{ attribute: 'Dimmer', offset: '1', geometry: 'Head', dmxBreak: 'Overwrite' }]
		}
	]
);

/** A mode over two DMX breaks: 6 slots on break 1, 4 slots on break 2 (DMXChannel DMXBreak). */
export const TWO_BREAK_XML = fixtureXml('Twin Feed', `<Geometry Name="Body"/>`, [
	{
		name: 'Split',
		geometry: 'Body',
		channels: [
			{ attribute: 'Dimmer', offset: '1,2', geometry: 'Body' },
			{ attribute: 'ColorAdd_R', offset: '6', geometry: 'Body' },
			{ attribute: 'ColorAdd_G', offset: '1', geometry: 'Body', dmxBreak: '2' },
			{ attribute: 'ColorAdd_B', offset: '4', geometry: 'Body', dmxBreak: '2' }
		]
	}
]);

/** Offsets: 32-bit "2,3,4,5" after "1" → 5 slots; "2,1" → 2; "2,9" → 9; "1,3" with "2" → 3 (DMXChannel Offset). */
export const OFFSETS_XML = fixtureXml('Wide Offsets', `<Geometry Name="Body"/>`, [
	{
		name: 'Thirty-two',
		geometry: 'Body',
		channels: [
			{ attribute: 'Dimmer', offset: '1', geometry: 'Body' },
			{ attribute: 'Pan', offset: '2,3,4,5', geometry: 'Body' }
		]
	},
	{ name: 'Reversed', geometry: 'Body', channels: [{ attribute: 'Pan', offset: '2,1', geometry: 'Body' }] },
	{ name: 'Apart', geometry: 'Body', channels: [{ attribute: 'Pan', offset: '2,9', geometry: 'Body' }] },
	{
		name: 'Interleaved',
		geometry: 'Body',
		channels: [
			{ attribute: 'Pan', offset: '1,3', geometry: 'Body' },
			{ attribute: 'Tilt', offset: '2', geometry: 'Body' }
		]
	}
]);

/** Values and ranges: 16-bit dimmer defaulting to "255/1" and "255/1s"; CTC 10000 → 2000 K over DMX 0–199. */
export const VALUES_XML = fixtureXml('Value Lamp', `<Geometry Name="Body"/>`, [
	{
		name: 'Mirror',
		geometry: 'Body',
		channels: [
			{ attribute: 'Dimmer', offset: '1,2', geometry: 'Body', initialDefault: '255/1' },
			{
				attribute: 'CTC',
				offset: '3',
				geometry: 'Body',
				functions: [
					{ dmxFrom: '0/1', default: '0/1', physicalFrom: 10000, physicalTo: 2000 },
					{ dmxFrom: '200/1', default: '200/1' }
				]
			}
		]
	},
	{
		name: 'Shift',
		geometry: 'Body',
		channels: [{ attribute: 'Dimmer', offset: '1,2', geometry: 'Body', initialDefault: '255/1s' }]
	}
]);

/** Every GDTF test file and the footprint per break of each mode that a re-import must give. */
export const GDTF_FILES: { name: string; xml: string; footprints: Record<string, number[]> }[] = [
	{ name: 'panel', xml: PANEL_XML, footprints: { 'Basic 8': [2], 'HSI 16': [5], Cells: [6] } },
	{ name: '12-cell bar', xml: BAR_XML, footprints: { 'Pixel RGBW': [48] } },
	{ name: 'four-head unit', xml: QUAD_XML, footprints: { Heads: [4] } },
	{ name: 'two-break mode', xml: TWO_BREAK_XML, footprints: { Split: [6, 4] } },
	{ name: 'offsets', xml: OFFSETS_XML, footprints: { 'Thirty-two': [5], Reversed: [2], Apart: [9], Interleaved: [3] } },
	{ name: 'values', xml: VALUES_XML, footprints: { Mirror: [3], Shift: [2] } }
];
