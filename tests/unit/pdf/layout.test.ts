import QRCode from 'qrcode';
import { describe, expect, it } from 'vitest';
import { columnWidths, lineCount, MM, paperSize, fonts } from '../../../src/lib/server/pdf/common';
import { slugify } from '../../../src/lib/server/download-name';
import { signoffLine } from '../../../src/lib/server/pdf/data';
import { labelCell, labelGrid, qrRuns } from '../../../src/lib/server/pdf/label-sheet';
import { addressText, channelList } from '../../../src/lib/server/pdf/patch-sheet';
import { valueRange } from '../../../src/lib/server/pdf/radio-sheet';
import { parseSheetQuery, sheetFileName } from '../../../src/lib/server/pdf/respond';

describe('paper and label grid', () => {
	it('uses the ISO 216 A4 and ANSI US Letter sizes in points', () => {
		// ISO 216: A4 is 210 × 297 mm; US Letter is 8.5 × 11 in (72 pt per inch)
		expect(paperSize('a4').width).toBeCloseTo(210 * MM, 1);
		expect(paperSize('a4').height).toBeCloseTo(297 * MM, 1);
		expect(paperSize('letter')).toEqual({ width: 8.5 * 72, height: 11 * 72 });
	});

	it.each(['a4', 'letter'] as const)('fits 3 × 8 labels on %s with at least 5 mm of paper around the grid', (paper) => {
		const g = labelGrid(paper);
		const page = paperSize(paper);
		expect(g.columns * g.rows).toBe(24);
		expect(g.left).toBeGreaterThanOrEqual(5 * MM);
		expect(g.top).toBeGreaterThanOrEqual(5 * MM);
		expect(g.left + g.columns * g.width).toBeLessThanOrEqual(page.width - 5 * MM);
		expect(g.top + g.rows * g.height).toBeLessThanOrEqual(page.height - 5 * MM);
	});

	it('fills cells left to right, top to bottom, then the next page', () => {
		const g = labelGrid('a4');
		expect(labelCell(g, 0)).toEqual({ page: 0, x: g.left, y: g.top });
		expect(labelCell(g, 4)).toEqual({ page: 0, x: g.left + g.width, y: g.top + g.height });
		expect(labelCell(g, 24)).toEqual({ page: 1, x: g.left, y: g.top });
	});
});

describe('QR runs', () => {
	it('cover exactly the dark modules of the code (ISO/IEC 18004 module matrix from the qrcode package)', () => {
		const modules = QRCode.create('http://127.0.0.1:3000/projects/1/fixtures/101', {
			errorCorrectionLevel: 'M'
		}).modules;
		const drawn = new Set<string>();
		for (const r of qrRuns(modules)) for (let c = r.col; c < r.col + r.length; c++) drawn.add(`${r.row},${c}`);
		let dark = 0;
		for (let row = 0; row < modules.size; row++)
			for (let col = 0; col < modules.size; col++) {
				if (modules.get(row, col)) {
					dark++;
					expect(drawn.has(`${row},${col}`)).toBe(true);
				}
			}
		expect(drawn.size).toBe(dark);
	});
});

describe('table helpers', () => {
	it('split the width by share and add up to the whole', () => {
		const w = columnWidths(
			[
				{ key: 'a', title: '', width: 1 },
				{ key: 'b', title: '', width: 3 }
			],
			400
		);
		expect(w[0]).toBe(100);
		expect(w[0] + w[1]).toBe(400);
	});

	it('wrap words greedily (one unit per character here)', () => {
		const measure = (s: string) => s.length;
		expect(lineCount(measure, '', 10)).toBe(1);
		expect(lineCount(measure, 'aaa bbb', 7)).toBe(1);
		expect(lineCount(measure, 'aaa bbb', 6)).toBe(2);
		expect(lineCount(measure, 'one\ntwo', 20)).toBe(2);
		// a word longer than the cell breaks by characters
		expect(lineCount(measure, 'abcdefghij', 4)).toBe(3);
	});
});

describe('what the sheets say', () => {
	it('write address runs as universe.start–end (common practice on patch sheets)', () => {
		expect(addressText(7, [{ start: 505, end: 512 }])).toBe('7.505–512');
		expect(
			addressText(4, [
				{ start: 20, end: 20 },
				{ start: 30, end: 31 }
			])
		).toBe('4.20, 4.30–31');
	});

	it('list channels by offset, 16-bit as coarse/fine, and dmx-map by each parameter’s address', () => {
		const mode = {
			id: 1,
			name: 'm',
			channels: [
				{ offset: 1, parameter: 'intensity', bits: 16 as const, default: 0 },
				{ offset: 3, parameter: 'hue', bits: 8 as const, default: 0 },
				{ offset: null, parameter: 'fx', bits: 8 as const, default: 0 }
			]
		};
		expect(channelList(mode, { kind: 'dmx', universeId: 1, address: 100 })).toBe(
			'1/2 intensity · 3 hue · fx (no slot)'
		);
		expect(channelList(mode, { kind: 'dmx-map', universeId: 1, addresses: { intensity: 20, hue: 30 } }, () => 4)).toBe(
			'4.20/21 intensity · 4.30 hue · fx (no slot)'
		);
		// the same dmx fixture at its absolute addresses: start 100, so intensity 100/101 and hue 102
		expect(channelList(mode, { kind: 'dmx', universeId: 1, address: 100 }, () => 7)).toBe(
			'7.100/101 intensity · 7.102 hue · fx (no slot)'
		);
	});

	it('give the SBUS/CRSF value range as raw 172–1811 and 988–2012 µs; PPM in µs; SBUS 17–18 digital (common practice)', () => {
		expect(valueRange('sbus', 1)).toBe('raw 172–1811 · 988–2012 µs');
		expect(valueRange('crsf', 16)).toBe('raw 172–1811 · 988–2012 µs');
		expect(valueRange('ppm', 8)).toBe('988–2012 µs');
		expect(valueRange('sbus', 17)).toBe('on / off (digital)');
	});

	it('state the sign-off: approved, changes requested, stale once a later revision exists, or none (DESIGN "Revision")', () => {
		const at = new Date('2026-03-04T10:00:00Z');
		expect(signoffLine({ decision: 'approved', name: 'Ada', createdAt: at }, null, 3)).toEqual({
			state: 'approved',
			text: 'r3 approved by Ada on 2026-03-04'
		});
		expect(signoffLine({ decision: 'approved', name: 'Ada', createdAt: at }, 4, 3).state).toBe('stale');
		expect(signoffLine({ decision: 'approved', name: 'Ada', createdAt: at }, 4, 3).text).toContain('r4 is newer');
		expect(signoffLine({ decision: 'changes-requested', name: 'Bo', createdAt: at }, null, 2).text).toBe(
			'r2 changes requested by Bo on 2026-03-04'
		);
		expect(signoffLine(undefined, null, 2).state).toBe('none');
	});

	it('name files <project-slug>-<sheet>-r<n>.pdf or -draft.pdf', () => {
		expect(slugify('The Lantern Ferry — river unit')).toBe('the-lantern-ferry-river-unit');
		expect(slugify('Ça va? Öl & Tee')).toBe('ca-va-ol-tee');
		expect(slugify('———')).toBe('project');
		expect(sheetFileName('patch', 'The Lantern Ferry — river unit', 3)).toBe(
			'the-lantern-ferry-river-unit-patch-r3.pdf'
		);
		expect(sheetFileName('labels', 'Rig', null)).toBe('rig-labels-draft.pdf');
	});

	it('read the query strictly: bad paper, revision or fixture numbers are refused', () => {
		const q = (s: string, kind: 'patch' | 'labels' = 'labels') => parseSheetQuery(new URLSearchParams(s), kind);
		expect(q('')).toEqual({ paper: 'a4' });
		expect(q('paper=letter&revision=3&fixtures=5,2,5')).toEqual({ paper: 'letter', revision: 3, fixtures: [5, 2] });
		expect(() => q('paper=a3')).toThrow(/a4 or letter/);
		expect(() => q('revision=0')).toThrow(/whole number/);
		expect(() => q('revision=1.5')).toThrow(/whole number/);
		expect(() => q('fixtures=1,x')).toThrow(/fixture number/);
		expect(() => q('fixtures=1', 'patch')).toThrow(/labels/);
		expect(q('channels=absolute', 'patch')).toEqual({ paper: 'a4', absolute: true });
		expect(q('channels=offsets', 'patch')).toEqual({ paper: 'a4' });
		expect(() => q('channels=absolute')).toThrow(/patch sheet/);
		expect(() => q('channels=__proto__', 'patch')).toThrow(/offsets or absolute/);
	});
});

describe('fonts', () => {
	it('load IBM Plex Sans Regular and SemiBold as TrueType that fontkit reads, with the glyphs the sheets print', async () => {
		// fontkit (pdfkit's font engine) ships no types; a string specifier keeps tsc out of it
		const specifier: string = 'fontkit';
		const fontkit = (await import(specifier)) as { create(b: Buffer): unknown };
		const names = { Plex: 'IBMPlexSans-Regular', 'Plex-SemiBold': 'IBMPlexSans-SemiBold' };
		for (const [key, postscriptName] of Object.entries(names)) {
			const ttf = fonts()[key];
			// OpenType spec: sfnt version 0x00010000 marks TrueType outlines
			expect(ttf.readUInt32BE(0)).toBe(0x00010000);
			const font = fontkit.create(ttf) as { postscriptName: string; hasGlyphForCodePoint(c: number): boolean };
			expect(font.postscriptName).toBe(postscriptName);
			// the characters the sheets print, including the project names people type
			for (const ch of '–—·µ°›…éüÇ') expect(font.hasGlyphForCodePoint(ch.codePointAt(0)!)).toBe(true);
		}
	});
});
