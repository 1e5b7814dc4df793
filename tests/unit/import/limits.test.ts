import { strToU8, zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { DomainError } from '../../../src/lib/server/errors';
import { refusal } from '../../helpers/refusal';
import { readGdtfArchive } from '../../../src/lib/server/import/gdtf';
import { guardXml, safeUnzip, sniff, unsafeEntryName } from '../../../src/lib/server/import/limits';

describe('upload limits', () => {
	it('sniffs by content: zip magic PK\\x03\\x04 (APPNOTE.TXT), JSON, text, binary', () => {
		expect(sniff(zipSync({ a: strToU8('x') }))).toBe('zip');
		expect(sniff(strToU8('  {"format":1}'))).toBe('json');
		expect(sniff(strToU8('number,label\r\n1,A'))).toBe('text');
		expect(sniff(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))).toBe('binary');
		expect(sniff(new Uint8Array([0x41, 0xff, 0xfe, 0x41]))).toBe('binary');
	});

	it('does not mistake a multi-byte character cut at the 4 KB window for bad UTF-8', () => {
		const text = 'a'.repeat(4095) + 'é' + 'tail';
		expect(sniff(strToU8(text))).toBe('text');
	});

	it('refuses entry names that climb out, are absolute, or use backslashes', () => {
		for (const n of ['../evil', 'a/../../b', '/etc/passwd', 'C:/x', 'a\\b']) expect(unsafeEntryName(n)).toBe(true);
		expect(unsafeEntryName('models/3ds/body.3ds')).toBe(false);
		const e = refusal(() =>
			safeUnzip(zipSync({ 'description.xml': strToU8('<a/>'), '../../x.txt': strToU8('x') }), () => true)
		);
		expect(e.extra.code).toBe('zip-path');
	});

	it('stops inflating a zip bomb at the byte budget', () => {
		// 8 MB of zeros deflates to a few KB: a small bomb against a 1 MB budget
		const bomb = zipSync({ 'description.xml': new Uint8Array(8 * 1024 * 1024) }, { level: 9 });
		expect(bomb.length).toBeLessThan(64 * 1024);
		const e = refusal(() => safeUnzip(bomb, () => true, { maxInflated: 1024 * 1024 }));
		expect(e.status).toBe(413);
		expect(e.extra.code).toBe('zip-too-large');
	});

	it('caps the entry count, and reads only the entries asked for', () => {
		const many: Record<string, Uint8Array> = {};
		for (let i = 0; i < 30; i++) many[`f${i}.txt`] = strToU8('x');
		expect(refusal(() => safeUnzip(zipSync(many), () => false, { maxEntries: 20 })).extra.code).toBe('zip-entries');
		const out = safeUnzip(zipSync({ ...many, 'description.xml': strToU8('<GDTF/>') }), (n) => n === 'description.xml');
		expect([...out.keys()]).toEqual(['description.xml']);
		expect(new TextDecoder().decode(out.get('description.xml'))).toBe('<GDTF/>');
	});

	it('refuses a damaged archive and an archive without description.xml', () => {
		const zip = zipSync({ 'description.xml': strToU8('<GDTF>' + 'x'.repeat(5000) + '</GDTF>') });
		const cut = zip.slice(0, 60);
		const e = refusal(() => readGdtfArchive(cut));
		expect([400, 422]).toContain(e.status);
		expect(refusal(() => readGdtfArchive(zipSync({ 'other.xml': strToU8('<a/>') }))).message).toContain(
			'no description.xml'
		);
	});

	it('refuses DTDs however they are cased', () => {
		expect(() => guardXml('<?xml version="1.0"?><!doctype x><x/>')).toThrow(DomainError);
		expect(() => guardXml('<GDTF DataVersion="1.1"/>')).not.toThrow();
	});
});
