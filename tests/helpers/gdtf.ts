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
