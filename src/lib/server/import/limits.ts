import { Unzip, UnzipInflate } from 'fflate';
import iconv from 'iconv-lite';
import { DomainError, InvalidError, TooLargeError, UnsupportedTypeError } from '../errors';

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

/**
 * Refuses any DTD (no entity expansion — billion laughs — and no external fetch can follow from a
 * file we never parse), then checks the XML's shape against XML_LIMITS before a parser allocates.
 */
export function guardXml(text: string): void {
	if (/<!DOCTYPE/i.test(text) || /<!ENTITY/i.test(text)) {
		throw new InvalidError('The XML declares a DOCTYPE or entities; those are refused.', undefined, {
			code: 'xml-dtd'
		});
	}
	boundXml(text);
}

/**
 * What a GDTF description.xml may hold. A fixture type with hundreds of modes and geometries stays
 * far below each; a parser building objects for more would spend gigabytes (issue 20: two million
 * attributes took 2.1 GB, one 20 MB attribute 650 MB).
 */
export interface XmlLimits {
	elements: number;
	depth: number;
	attributesPerElement: number;
	attributes: number;
	attributeLength: number;
}

export const XML_LIMITS: Readonly<XmlLimits> = {
	elements: 500_000,
	depth: 100,
	attributesPerElement: 256,
	attributes: 1_000_000,
	/** characters in one attribute value */
	attributeLength: 65_536
};

const n = (x: number) => x.toLocaleString('en-GB');

/**
 * One pass over the text, allocating nothing per element: counts elements, nesting depth,
 * attributes (per element and in all) and the length of each attribute value, and refuses at the
 * first bound crossed. Malformed markup stops the count; the parser then says what is wrong.
 */
export function boundXml(text: string, limits: Readonly<XmlLimits> = XML_LIMITS): void {
	const tooLarge = (code: string, message: string) => new TooLargeError(message, { code });
	let elements = 0;
	let attributes = 0;
	let depth = 0;
	let i = 0;
	const len = text.length;
	const space = (c: number) => c === 0x20 || c === 0x09 || c === 0x0a || c === 0x0d;
	while (i < len) {
		const lt = text.indexOf('<', i);
		if (lt < 0) return;
		const next = text.charCodeAt(lt + 1);
		if (next === 0x21 /* ! */) {
			const [open, close] = text.startsWith('<!--', lt)
				? ['<!--', '-->']
				: text.startsWith('<![CDATA[', lt)
					? ['<![CDATA[', ']]>']
					: ['<!', '>'];
			const end = text.indexOf(close, lt + open.length);
			if (end < 0) return;
			i = end + close.length;
			continue;
		}
		if (next === 0x3f /* ? */) {
			const end = text.indexOf('?>', lt + 2);
			if (end < 0) return;
			i = end + 2;
			continue;
		}
		if (next === 0x2f /* / */) {
			depth--;
			const end = text.indexOf('>', lt + 2);
			if (end < 0) return;
			i = end + 1;
			continue;
		}
		if (++elements > limits.elements)
			throw tooLarge(
				'xml-elements',
				`description.xml has more than ${n(limits.elements)} elements; no fixture type needs that many. Refused.`
			);
		let j = lt + 1;
		while (j < len && !space(text.charCodeAt(j)) && text[j] !== '>' && text[j] !== '/') j++;
		let inElement = 0;
		for (;;) {
			while (j < len && space(text.charCodeAt(j))) j++;
			if (j >= len) return;
			const c = text[j];
			if (c === '>') {
				if (++depth > limits.depth)
					throw new InvalidError(
						`description.xml nests elements more than ${limits.depth} deep; no fixture type needs that. Refused.`,
						undefined,
						{ code: 'xml-depth' }
					);
				i = j + 1;
				break;
			}
			if (c === '/') {
				i = j + 1;
				break;
			}
			const eq = text.indexOf('=', j);
			if (eq < 0) return;
			if (++inElement > limits.attributesPerElement)
				throw tooLarge(
					'xml-attributes',
					`An element of description.xml has more than ${n(limits.attributesPerElement)} attributes; no fixture type needs that many. Refused.`
				);
			if (++attributes > limits.attributes)
				throw tooLarge(
					'xml-attributes',
					`description.xml has more than ${n(limits.attributes)} attributes; no fixture type needs that many. Refused.`
				);
			j = eq + 1;
			while (j < len && space(text.charCodeAt(j))) j++;
			const quote = text[j];
			if (quote !== '"' && quote !== "'") return;
			const end = text.indexOf(quote, j + 1);
			if (end < 0) return;
			if (end - j - 1 > limits.attributeLength)
				throw tooLarge(
					'xml-attribute-length',
					`An attribute in description.xml is ${n(end - j - 1)} characters long; at most ${n(limits.attributeLength)} are read. Refused.`
				);
			j = end + 1;
		}
	}
}

export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

const SAVE_AS_UTF8 =
	'The file’s text encoding could not be worked out. In your spreadsheet program choose “Save as” → “CSV UTF-8” and import that file.';

// bytes Windows-1252 leaves undefined (WHATWG Encoding maps them to C1 controls no spreadsheet writes)
const CP1252_UNDEFINED = new Set([0x81, 0x8d, 0x8f, 0x90, 0x9d]);

function isControl(b: number): boolean {
	return b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c;
}

/** UTF-16 without a BOM: ASCII-range text puts a zero in every other byte. */
function utf16Without(bytes: Uint8Array): 'utf-16le' | 'utf-16be' | null {
	const n = Math.min(bytes.length - (bytes.length % 2), 4096);
	if (n < 4) return null;
	let evenZero = 0;
	let oddZero = 0;
	for (let i = 0; i < n; i += 2) {
		if (bytes[i] === 0) evenZero++;
		if (bytes[i + 1] === 0) oddZero++;
	}
	const pairs = n / 2;
	if (oddZero > pairs * 0.6 && evenZero === 0) return 'utf-16le';
	if (evenZero > pairs * 0.6 && oddZero === 0) return 'utf-16be';
	return null;
}

/**
 * The text of a spreadsheet's "CSV" in whatever encoding desktop programs write: UTF-8 (with or
 * without BOM), UTF-16 ("Unicode text", BOM or not) or Windows-1252 (a plain "CSV" on many desks).
 * Answers null for bytes that are not text at all; refuses (415) text it cannot decide.
 */
export function decodeSpreadsheet(bytes: Uint8Array): { text: string; encoding: TextEncoding } | null {
	const undecidable = () => new UnsupportedTypeError(SAVE_AS_UTF8, { code: 'unsupported-encoding' });
	const utf16 = (encoding: 'utf-16le' | 'utf-16be', body: Uint8Array) => {
		if (body.length % 2 !== 0) throw undecidable();
		const text = iconv.decode(Buffer.from(body), encoding);
		if (text.includes('\uFFFD') || [...text.slice(0, 4096)].some((c) => isControl(c.charCodeAt(0))))
			throw undecidable();
		return { text, encoding };
	};
	if (bytes[0] === 0xff && bytes[1] === 0xfe) return utf16('utf-16le', bytes.subarray(2));
	if (bytes[0] === 0xfe && bytes[1] === 0xff) return utf16('utf-16be', bytes.subarray(2));
	const bom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
	const body = bom ? bytes.subarray(3) : bytes;
	if (!bom) {
		const wide = utf16Without(body);
		if (wide) return utf16(wide, body);
	}
	if (body.some(isControl)) {
		if (bom) throw undecidable();
		return null;
	}
	try {
		return { text: new TextDecoder('utf-8', { fatal: true }).decode(body), encoding: 'utf-8' };
	} catch {
		// not UTF-8: a legacy single-byte file; Windows-1252 unless it holds bytes that code page lacks
		if (bom || body.some((b) => CP1252_UNDEFINED.has(b))) throw undecidable();
		return { text: iconv.decode(Buffer.from(body), 'windows-1252'), encoding: 'windows-1252' };
	}
}
