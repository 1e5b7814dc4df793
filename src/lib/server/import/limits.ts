import { Unzip, UnzipInflate } from 'fflate';
import { InvalidError, TooLargeError, UnsupportedTypeError, type DomainError } from '../errors';

// Everything an upload must pass before its content is believed: a size cap,
// content sniffing (never the file name), a zip reader that stops inflating at
// a byte budget, and an XML guard that refuses DTDs before any parser sees them.

export const MAX_UPLOAD_BYTES = 20 * 1024 * 1024;
/** multipart framing around the file */
export const MAX_FORM_BYTES = MAX_UPLOAD_BYTES + 64 * 1024;
export const MAX_INFLATED_BYTES = 32 * 1024 * 1024;
export const MAX_ZIP_ENTRIES = 2000;
/** compressed bytes fed per step: bounds what one inflate step can produce (deflate tops out near 1032:1) */
const FEED_BYTES = 8 * 1024;

export type Sniffed = 'zip' | 'json' | 'text' | 'binary';

/** Decides what a file is from its bytes. */
export function sniff(bytes: Uint8Array): Sniffed {
	if (bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04)
		return 'zip';
	let start = 0;
	if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) start = 3;
	const head = bytes.subarray(start, start + 4096);
	for (const b of head) {
		// NUL and the C0 controls other than tab, LF, CR, FF never appear in a CSV or JSON text
		if (b === 0 || (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c)) return 'binary';
	}
	try {
		new TextDecoder('utf-8', { fatal: true }).decode(
			head.length === bytes.length - start ? head : trimPartialUtf8(head)
		);
	} catch {
		return 'binary';
	}
	const first = head.find((b) => b !== 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d);
	return first === 0x7b ? 'json' : 'text';
}

/** A 4 KB window may cut a multi-byte character in two; drop the cut tail before strict decoding. */
function trimPartialUtf8(b: Uint8Array): Uint8Array {
	let end = b.length;
	let back = 0;
	while (end > 0 && back < 3 && (b[end - 1] & 0xc0) === 0x80) {
		end--;
		back++;
	}
	if (end > 0 && b[end - 1] >= 0xc0) end--;
	return b.subarray(0, end);
}

/** UTF-8 text of an upload (a BOM dropped); refuses bytes that are not UTF-8. */
export function decodeText(bytes: Uint8Array): string {
	try {
		return new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
	} catch {
		throw new UnsupportedTypeError('The file is not UTF-8 text.');
	}
}

/** Entry names that could escape a directory or mean different things on different systems. */
export function unsafeEntryName(name: string): boolean {
	return (
		name.length === 0 ||
		name.includes('\\') ||
		name.includes('\0') ||
		name.startsWith('/') ||
		/^[a-zA-Z]:/.test(name) ||
		name.split('/').some((part) => part === '..')
	);
}

export interface UnzipLimits {
	maxInflated?: number;
	maxEntries?: number;
}

/**
 * Inflates only the entries `want` picks, feeding the archive in small steps and
 * counting every inflated byte, so a zip bomb stops at the budget instead of
 * filling memory. Every entry name is checked, wanted or not.
 */
export function safeUnzip(
	bytes: Uint8Array,
	want: (name: string) => boolean,
	limits: UnzipLimits = {}
): Map<string, Uint8Array> {
	const maxInflated = limits.maxInflated ?? MAX_INFLATED_BYTES;
	const maxEntries = limits.maxEntries ?? MAX_ZIP_ENTRIES;
	const out = new Map<string, Uint8Array>();
	let entries = 0;
	let inflated = 0;
	let failure: DomainError | null = null;
	const fail = (e: DomainError) => {
		failure ??= e;
	};
	const unzip = new Unzip((file) => {
		if (failure) return;
		entries++;
		if (entries > maxEntries)
			return fail(
				new InvalidError(`The archive has more than ${maxEntries} entries.`, undefined, { code: 'zip-entries' })
			);
		if (unsafeEntryName(file.name))
			return fail(
				new InvalidError(`The archive holds an unsafe entry name: "${file.name.slice(0, 120)}".`, undefined, {
					code: 'zip-path'
				})
			);
		if (!want(file.name)) return;
		if (file.compression !== 0 && file.compression !== 8)
			return fail(
				new InvalidError(`"${file.name}" uses a zip compression other than deflate.`, undefined, { code: 'zip-method' })
			);
		const chunks: Uint8Array[] = [];
		file.ondata = (err, data, final) => {
			if (failure) return;
			if (err)
				return fail(
					new InvalidError(`"${file.name}" could not be inflated: the archive is damaged.`, undefined, {
						code: 'zip-damaged'
					})
				);
			inflated += data.length;
			if (inflated > maxInflated) {
				file.terminate();
				return fail(
					new TooLargeError(`The archive inflates past ${Math.round(maxInflated / 1024 / 1024)} MB; refused.`, {
						code: 'zip-too-large'
					})
				);
			}
			chunks.push(data);
			if (final) out.set(file.name, concat(chunks));
		};
		file.start();
	});
	unzip.register(UnzipInflate);
	try {
		for (let i = 0; i < bytes.length && !failure; i += FEED_BYTES) {
			const end = Math.min(bytes.length, i + FEED_BYTES);
			unzip.push(bytes.subarray(i, end), end === bytes.length);
		}
	} catch {
		fail(new InvalidError('The archive is damaged or not a zip file.', undefined, { code: 'zip-damaged' }));
	}
	if (failure) throw failure;
	return out;
}

function concat(chunks: Uint8Array[]): Uint8Array {
	const total = chunks.reduce((n, c) => n + c.length, 0);
	const all = new Uint8Array(total);
	let at = 0;
	for (const c of chunks) {
		all.set(c, at);
		at += c.length;
	}
	return all;
}

/** Refuses any DTD: no entity expansion (billion laughs) and no external fetch can follow from a file we never parse. */
export function guardXml(text: string): void {
	if (/<!DOCTYPE/i.test(text) || /<!ENTITY/i.test(text)) {
		throw new InvalidError('The XML declares a DOCTYPE or entities; those are refused.', undefined, {
			code: 'xml-dtd'
		});
	}
}
