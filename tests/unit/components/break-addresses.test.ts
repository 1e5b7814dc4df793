import { describe, expect, it } from 'vitest';
import { BreakAddresses, rowProblem } from '../../../src/lib/components/break-addresses.svelte';

// The fixture page's start-address editor: one row per DMX break (DIN SPEC 15800 DMX mode), slots
// 1–512 and no footprint past 512 (ANSI E1.11).

const twoBreaks = [
	{ dmxBreak: 1, slots: 6 },
	{ dmxBreak: 2, slots: 4 }
];

describe('BreakAddresses', () => {
	it("starts from the fixture's control, a row per break, and gives back the API's dmx control", () => {
		const e = new BreakAddresses(twoBreaks, {
			kind: 'dmx',
			universeId: 3,
			address: 1,
			breaks: [{ dmxBreak: 2, universeId: 4, address: 10 }]
		});
		expect(e.rows).toEqual([
			{ dmxBreak: 1, slots: 6, universeId: '3', address: '1' },
			{ dmxBreak: 2, slots: 4, universeId: '4', address: '10' }
		]);
		e.set(2, 'address', '20');
		expect(e.control).toEqual({
			kind: 'dmx',
			universeId: 3,
			address: 1,
			breaks: [{ dmxBreak: 2, universeId: 4, address: 20 }]
		});
		const one = new BreakAddresses([{ dmxBreak: 1, slots: 6 }], { kind: 'manual' });
		one.set(1, 'universeId', '3');
		one.set(1, 'address', '7');
		expect(one.control).toEqual({ kind: 'dmx', universeId: 3, address: 7 });
	});

	it('says what is wrong with a row in plain words, only once a save was tried', () => {
		const e = new BreakAddresses(twoBreaks, { kind: 'dmx', universeId: 3, address: 1 });
		expect(e.errors).toEqual({});
		expect(e.control).toBeNull();
		e.tried = true;
		expect(e.errors).toEqual({ 2: 'Break 2 needs a universe and a start address.' });
		e.set(2, 'universeId', '4');
		e.set(2, 'address', '510');
		expect(e.errors).toEqual({
			2: 'Break 2 needs 4 slots; from 510 it would run to slot 513, past 512. Start at 509 or lower.'
		});
		expect(rowProblem({ dmxBreak: 1, slots: 6, universeId: '3', address: 'x1' })).toBe(
			'"x1" is not an address; write a number from 1 to 512.'
		);
		expect(rowProblem({ dmxBreak: 1, slots: 6, universeId: '3', address: '0' })).toBe('Address 0 is outside 1–512.');
		expect(rowProblem({ dmxBreak: 1, slots: 6, universeId: '9', address: '1' }, new Set([3]))).toBe(
			'That universe is gone; choose another for break 1.'
		);
	});

	it("puts the server's issues on their rows (API paths and form field names) until that row changes", () => {
		const e = new BreakAddresses(twoBreaks, {
			kind: 'dmx',
			universeId: 3,
			address: 1,
			breaks: [{ dmxBreak: 2, universeId: 4, address: 10 }]
		});
		const rest = e.takeIssues([
			{ path: ['control', 'breaks', 0, 'universeId'], message: 'No such universe in this project.' },
			{ path: ['address-1'], message: 'Taken.' },
			{ path: ['version'], message: 'Stale.' }
		]);
		expect(rest).toEqual(['Stale.']);
		expect(e.errors).toEqual({ 1: 'Taken.', 2: 'No such universe in this project.' });
		e.set(2, 'universeId', '5');
		expect(e.errors).toEqual({ 1: 'Taken.' });
	});
});
