// Universe numbering on the wire: sACN multicast groups and Art-Net port-addresses.

export const SACN_MIN_UNIVERSE = 1;
export const SACN_MAX_UNIVERSE = 63999;
export const ARTNET_MAX_PORT_ADDRESS = 32767;

export function isSacnUniverse(universe: number): boolean {
	return Number.isInteger(universe) && universe >= SACN_MIN_UNIVERSE && universe <= SACN_MAX_UNIVERSE;
}

/** ANSI E1.31 §9.3.1: universe u is sent to 239.255.(u >> 8).(u & 255); universes are 1–63999. */
export function sacnMulticastGroup(universe: number): string {
	if (!isSacnUniverse(universe)) throw new RangeError(`sACN universe ${universe} is outside 1–63999`);
	return `239.255.${universe >> 8}.${universe & 255}`;
}

/** The universe a 239.255.h.l group carries, or null if the address is not an sACN group. */
export function sacnUniverseFromGroup(group: string): number | null {
	const m = /^239\.255\.(\d{1,3})\.(\d{1,3})$/.exec(group);
	if (m === null) return null;
	const hi = Number(m[1]);
	const lo = Number(m[2]);
	if (hi > 255 || lo > 255) return null;
	const u = (hi << 8) | lo;
	return isSacnUniverse(u) ? u : null;
}

export interface ArtnetAddress {
	/** 7 bits, 0–127. */
	net: number;
	/** 4 bits, 0–15. */
	subnet: number;
	/** 4 bits, 0–15. */
	universe: number;
}

function checkField(name: string, v: number, max: number): void {
	if (!Number.isInteger(v) || v < 0 || v > max) throw new RangeError(`Art-Net ${name} ${v} is outside 0–${max}`);
}

/** Art-Net 4 port-address: 15 bits, net (7) << 8 | sub-net (4) << 4 | universe (4). */
export function artnetPortAddress(a: ArtnetAddress): number {
	checkField('net', a.net, 127);
	checkField('sub-net', a.subnet, 15);
	checkField('universe', a.universe, 15);
	return (a.net << 8) | (a.subnet << 4) | a.universe;
}

export function splitArtnetPortAddress(portAddress: number): ArtnetAddress {
	checkField('port-address', portAddress, ARTNET_MAX_PORT_ADDRESS);
	return { net: portAddress >> 8, subnet: (portAddress >> 4) & 15, universe: portAddress & 15 };
}

/**
 * The project's off-by-one between "universe N" on paper and the Art-Net port-address:
 * offset 1 means paper universe 1 is port-address 0; offset 0 means they are the same number.
 */
export type ArtnetOffset = 0 | 1;

export function paperToArtnet(paperUniverse: number, offset: ArtnetOffset): number {
	const pa = paperUniverse - offset;
	checkField('port-address', pa, ARTNET_MAX_PORT_ADDRESS);
	return pa;
}

export function artnetToPaper(portAddress: number, offset: ArtnetOffset): number {
	checkField('port-address', portAddress, ARTNET_MAX_PORT_ADDRESS);
	return portAddress + offset;
}

/** Both numbers a crew needs for a paper universe: the port-address and its net / sub-net / universe. */
export function artnetForUniverse(
	paperUniverse: number,
	offset: ArtnetOffset
): ArtnetAddress & { portAddress: number } {
	const portAddress = paperToArtnet(paperUniverse, offset);
	return { ...splitArtnetPortAddress(portAddress), portAddress };
}
