import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	artnetForUniverse,
	artnetPortAddress,
	artnetToPaper,
	paperToArtnet,
	sacnMulticastGroup,
	sacnUniverseFromGroup,
	splitArtnetPortAddress
} from '../../../src/lib/patch';

describe('sACN multicast groups — ANSI E1.31 §9.3.1', () => {
	it('sends universes 1, 256 and 63999 to 239.255.0.1, 239.255.1.0 and 239.255.249.255', () => {
		expect([1, 256, 63999].map(sacnMulticastGroup)).toEqual(['239.255.0.1', '239.255.1.0', '239.255.249.255']);
	});

	it('refuses universes outside 1–63999', () => {
		for (const u of [0, 64000, 1.5, -1]) expect(() => sacnMulticastGroup(u)).toThrow(RangeError);
	});

	it('reads a group back to its universe', () => {
		fc.assert(
			fc.property(fc.integer({ min: 1, max: 63999 }), (u) => {
				expect(sacnUniverseFromGroup(sacnMulticastGroup(u))).toBe(u);
			})
		);
		expect(sacnUniverseFromGroup('239.255.0.0')).toBeNull();
		expect(sacnUniverseFromGroup('239.255.300.1')).toBeNull();
	});
});

describe('Art-Net port-address — Art-Net 4: net 7 bits, sub-net 4, universe 4', () => {
	it('joins net 1 sub-net 2 universe 3 into 0x123 = 291, and the maximum into 32767', () => {
		expect(artnetPortAddress({ net: 1, subnet: 2, universe: 3 })).toBe(0x123);
		expect(artnetPortAddress({ net: 1, subnet: 2, universe: 3 })).toBe(291);
		expect(artnetPortAddress({ net: 127, subnet: 15, universe: 15 })).toBe(32767);
		expect(() => artnetPortAddress({ net: 128, subnet: 0, universe: 0 })).toThrow(RangeError);
		expect(() => splitArtnetPortAddress(32768)).toThrow(RangeError);
	});

	it('property: split and join are inverses over 0–32767', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 32767 }), (pa) => {
				expect(artnetPortAddress(splitArtnetPortAddress(pa))).toBe(pa);
			})
		);
	});

	it('applies the project offset: with offset 1, paper universe 1 is port-address 0', () => {
		expect(paperToArtnet(1, 1)).toBe(0);
		expect(paperToArtnet(1, 0)).toBe(1);
		expect(artnetToPaper(0, 1)).toBe(1);
		expect(artnetForUniverse(17, 1)).toEqual({ net: 0, subnet: 1, universe: 0, portAddress: 16 });
		expect(() => paperToArtnet(0, 1)).toThrow(RangeError);
	});
});
