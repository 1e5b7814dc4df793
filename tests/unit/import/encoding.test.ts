import { describe, expect, it } from 'vitest';
import { decodeSpreadsheet } from '../../../src/lib/server/import/limits';
import { parseCsvPatch } from '../../../src/lib/server/import/csv';

// What desktop spreadsheet programs write when asked for CSV / "Unicode text". Byte values from the
// WHATWG Encoding Standard's windows-1252 index (é = 0xE9, ü = 0xFC, € = 0x80) and the Unicode
// Standard §3.10 / §23.8 (BOM: EF BB BF for UTF-8, FF FE for UTF-16LE, FE FF for UTF-16BE).

const HEADER = 'Number;Label;Universe;Address\r\n';
const ROW = '1;Café Müller €;1;101\r\n';

function cp1252(text: string): Uint8Array {
	const map: Record<string, number> = { é: 0xe9, ü: 0xfc, '€': 0x80 };
	return Uint8Array.from([...text].map((c) => map[c] ?? c.charCodeAt(0)));
}

describe('decodeSpreadsheet', () => {
	it('reads UTF-8 with and without a BOM', () => {
		const bytes = new TextEncoder().encode(HEADER + ROW);
		expect(decodeSpreadsheet(bytes)).toEqual({ text: HEADER + ROW, encoding: 'utf-8' });
		const bom = Uint8Array.from([0xef, 0xbb, 0xbf, ...bytes]);
		expect(decodeSpreadsheet(bom)).toEqual({ text: HEADER + ROW, encoding: 'utf-8' });
	});

	it('reads a Windows-1252 "CSV" (é, ü, € as single bytes)', () => {
		const decoded = decodeSpreadsheet(cp1252(HEADER + ROW));
		expect(decoded).toEqual({ text: HEADER + ROW, encoding: 'windows-1252' });
		expect(parseCsvPatch(decoded!.text).rows[0]).toMatchObject({ label: 'Café Müller €', universe: 1, address: 101 });
	});

	it('reads UTF-16 "Unicode text" with a BOM (LE and BE) and UTF-16LE without one (tab-separated)', () => {
		const tsv = 'Number\tLabel\tUniverse\tAddress\r\n1\tCafé Müller\t2\t7\r\n';
		const le = Buffer.from(tsv, 'utf16le');
		expect(decodeSpreadsheet(Uint8Array.from([0xff, 0xfe, ...le]))).toEqual({ text: tsv, encoding: 'utf-16le' });
		const be = Buffer.from(le).swap16();
		expect(decodeSpreadsheet(Uint8Array.from([0xfe, 0xff, ...be]))).toEqual({ text: tsv, encoding: 'utf-16be' });
		expect(decodeSpreadsheet(new Uint8Array(le))).toEqual({ text: tsv, encoding: 'utf-16le' });
		expect(parseCsvPatch(tsv).rows[0]).toMatchObject({ label: 'Café Müller', universe: 2, address: 7 });
	});

	it('asks for "CSV UTF-8" when the encoding cannot be decided, and says null for binary files', () => {
		// 0x81 is undefined in windows-1252 and cannot start a UTF-8 sequence
		expect(() =>
			decodeSpreadsheet(Uint8Array.from([...cp1252(HEADER), 0x31, 0x3b, 0x81, 0x3b, 0x31, 0x3b, 0x31]))
		).toThrow(/CSV UTF-8/);
		// an odd byte count after a UTF-16 BOM is not UTF-16
		expect(() => decodeSpreadsheet(Uint8Array.from([0xff, 0xfe, 0x41, 0x00, 0x42]))).toThrow(/CSV UTF-8/);
		// PNG signature (ISO/IEC 15948): not text at all
		expect(
			decodeSpreadsheet(Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]))
		).toBeNull();
	});
});
