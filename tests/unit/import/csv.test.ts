import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { matchHeaders, parseCsvPatch } from '../../../src/lib/server/import/csv';
import { toCsv, CSV_COLUMNS } from '../../../src/lib/server/export/csv';

describe('CSV patch parsing', () => {
	it('matches headers loosely: case, spaces, punctuation and synonyms', () => {
		const { columns, ignored } = matchHeaders([
			'Fixture #',
			'Name',
			'Manufacturer',
			'Fixture Type',
			'DMX Mode',
			'Univ',
			'DMX Address',
			'Pos.',
			'Colour'
		]);
		expect(columns).toEqual({ number: 0, label: 1, maker: 2, model: 3, mode: 4, universe: 5, address: 6, position: 7 });
		expect(ignored).toEqual(['Colour']);
		expect(matchHeaders(['unit', 'ch', 'start']).columns).toEqual({ number: 0, address: 1 });
	});

	it('reads rows with spreadsheet row numbers (header = row 1) and "2.101" universe.address', () => {
		const text = 'Unit;Maker;Model;Mode;Patch\n12;Acme;Panel;Basic;2.101\n\n14;Acme;Panel;Basic;1/7\n';
		const { rows, issues } = parseCsvPatch(text);
		expect(issues).toEqual([]);
		expect(rows).toEqual([
			{ row: 2, number: 12, maker: 'Acme', model: 'Panel', mode: 'Basic', universe: 2, address: 101 },
			{ row: 4, number: 14, maker: 'Acme', model: 'Panel', mode: 'Basic', universe: 1, address: 7 }
		]);
	});

	it('reads "2.101" in the Universe column, alone or beside an address column that agrees (issue 18)', () => {
		const alone = parseCsvPatch('Number,Universe\n1,2.101\n2,3/7\n');
		expect(alone.issues).toEqual([]);
		expect(alone.rows).toEqual([
			{ row: 2, number: 1, universe: 2, address: 101 },
			{ row: 3, number: 2, universe: 3, address: 7 }
		]);
		const both = parseCsvPatch('Number,Universe,Address\n1,2.101,\n2,2.101,101\n3,2.101,5\n4,2,101\n');
		expect(both.rows.map((r) => [r.number, r.universe, r.address])).toEqual([
			[1, 2, 101],
			[2, 2, 101],
			[4, 2, 101]
		]);
		expect(both.issues).toEqual([
			{ row: 4, field: 'address', message: 'The universe column says 2.101 but the address column says 5.' }
		]);
	});

	it('names every bad row and field', () => {
		const text = ['number,universe,address', 'x,1,1', '3,1,abc', '3,1,5', '4,,9', '5,2,"3.9"'].join('\n');
		const { rows, issues } = parseCsvPatch(text);
		expect(issues).toEqual([
			{ row: 2, field: 'number', message: '"x" is not a fixture number.' },
			{ row: 3, field: 'address', message: '"abc" is not an address.' },
			{ row: 4, field: 'number', message: 'Fixture 3 is also on row 3.' },
			{ row: 5, field: 'universe', message: 'An address without a universe.' },
			{ row: 6, field: 'universe', message: 'The universe column says 2 but "3.9" says 3.' }
		]);
		expect(rows).toEqual([]);
	});

	it('refuses a file without a number or address column, naming what it found', () => {
		expect(() => parseCsvPatch('name,colour\nA,red')).toThrow(
			/no number or universe and address column \(found: name, colour\)/
		);
	});

	it('refuses more rows than one import takes (20,000, README "Limits")', () => {
		const rows = Array.from({ length: 20001 }, (_, i) => `${i + 1},1,1`);
		expect(() => parseCsvPatch(['number,universe,address', ...rows].join('\n'))).toThrow(
			/20001 rows; import at most 20000/
		);
		// trailing blank lines are not rows
		expect(parseCsvPatch(['number,universe,address', ...rows.slice(0, 20000), '', ''].join('\n')).rows).toHaveLength(
			20000
		);
	});

	it('a quoted cell with a line break is one row, as a spreadsheet shows it', () => {
		const { rows } = parseCsvPatch('number,label,universe,address\n1,"two\nlines",1,1\n2,B,1,10');
		expect(rows.map((r) => [r.row, r.number])).toEqual([
			[2, 1],
			[3, 2]
		]);
	});

	// DIN SPEC 15800 DMX mode: a mode may span several DMX breaks, each with its own start address.
	it('reads further breaks from the range column our export writes and from "break N" columns', () => {
		const text = [
			'number,universe,address,range,Break 3',
			'1,1,1,1.1–6; break 2 2.10–13,',
			'2,1,7,1.7–12; break 2 2.?,',
			'3,1,20,,3.5',
			'4,1,30,1.30–35; break 2 2.20–23,4/1'
		].join('\n');
		const { rows, issues, ignored } = parseCsvPatch(text);
		expect(issues).toEqual([]);
		expect(ignored).toEqual([]);
		expect(rows.map((r) => r.breaks)).toEqual([
			[{ dmxBreak: 2, universe: 2, address: 10 }],
			undefined,
			[{ dmxBreak: 3, universe: 3, address: 5 }],
			[
				{ dmxBreak: 2, universe: 2, address: 20 },
				{ dmxBreak: 3, universe: 4, address: 1 }
			]
		]);
	});

	it('names a bad break cell, a break without break 1, and a break column that disagrees with the range', () => {
		const text = [
			'number,universe,address,range,break 2',
			'1,1,1,,two.ten',
			'2,,,,2.10',
			'3,1,1,1.1–6; break 2 2.10–13,2.11',
			'4,1,1,1.1–6; break 1 2.10–13,'
		].join('\n');
		const { rows, issues } = parseCsvPatch(text);
		expect(rows).toEqual([]);
		expect(issues).toEqual([
			{ row: 2, field: 'break 2', message: '"two.ten" is not universe.address like 2.101 for break 2.' },
			{
				row: 3,
				field: 'address',
				message:
					'Break 2 has a universe and address but break 1 has none; give break 1 in the universe and address columns.'
			},
			{ row: 4, field: 'break 2', message: 'The break 2 column says 2.11 but the range column says 2.10–13.' },
			{ row: 5, field: 'range', message: 'Break 1 is not a further DMX break; breaks 2–64 go here.' }
		]);
	});

	it('takes back the quote our export puts before a formula-like cell', () => {
		const { rows } = parseCsvPatch(`number,label,universe,address\n1,"'=cue 1",1,1`);
		expect(rows[0].label).toBe('=cue 1');
	});
});

describe('CSV export escaping (OWASP CSV injection)', () => {
	it('prefixes a single quote to text cells starting with = + - @ tab or CR, including multi-line formulas', () => {
		const row = [1, '=HYPERLINK("x")', '+1', '-2', '@SUM(A1)', '\tx', '\rx', '=A1\n+B1', 'safe', 42];
		const out = Papa.parse<string[]>(toCsv([row.concat(Array(CSV_COLUMNS.length - row.length).fill(''))]), {
			header: false
		}).data[1];
		expect(out.slice(0, 10)).toEqual([
			'1',
			`'=HYPERLINK("x")`,
			"'+1",
			"'-2",
			"'@SUM(A1)",
			"'\tx",
			"'\rx",
			"'=A1\n+B1",
			'safe',
			'42'
		]);
	});
});
