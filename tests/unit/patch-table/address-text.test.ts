import { describe, expect, it } from 'vitest';
import { parseAddressText } from '../../../src/lib/address-text';

// ANSI E1.11 (DMX512-A): slots 1–512 follow the start code. "universe.address" is common practice
// on paperwork and is how the patch table shows a DMX address.

describe('parseAddressText', () => {
	it('reads universe.address and a bare address', () => {
		expect(parseAddressText('2.101')).toEqual({ ok: true, universe: 2, address: 101 });
		expect(parseAddressText(' 1.3 ')).toEqual({ ok: true, universe: 1, address: 3 });
		expect(parseAddressText('12/512')).toEqual({ ok: true, universe: 12, address: 512 });
		expect(parseAddressText('41')).toEqual({ ok: true, universe: null, address: 41 });
	});
	it('refuses 0 and 513 (E1.11: 512 slots) and words, with a sentence', () => {
		expect(parseAddressText('1.513')).toMatchObject({ ok: false, message: expect.stringContaining('1–512') });
		expect(parseAddressText('0')).toMatchObject({ ok: false });
		expect(parseAddressText('0.5')).toMatchObject({ ok: false, message: 'Universe numbers start at 1.' });
		expect(parseAddressText('two')).toMatchObject({ ok: false, message: expect.stringContaining('2.101') });
		expect(parseAddressText('1.2.3')).toMatchObject({ ok: false });
	});
});
