import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { inflateSync } from 'node:zlib';
import PDFDocument from 'pdfkit';

// What every printed sheet shares: paper, the embedded IBM Plex Sans, the
// title block on every page, a table that repeats its header row on each new
// page, and "page n of m" written once all pages exist.

export type Paper = 'a4' | 'letter';
export const PAPERS: readonly Paper[] = ['a4', 'letter'];

export const MM = 72 / 25.4;

/** Paper size in points, portrait. */
export function paperSize(paper: Paper): { width: number; height: number } {
	return paper === 'letter' ? { width: 612, height: 792 } : { width: 595.28, height: 841.89 };
}

export type Doc = PDFKit.PDFDocument;

// ── Fonts ───────────────────────────────────────────────────────────────────

export const FONT = 'Plex';
export const FONT_BOLD = 'Plex-SemiBold';

const FONT_FILES: Record<string, string> = {
	[FONT]: 'ibm-plex-sans-latin-400-normal.woff',
	[FONT_BOLD]: 'ibm-plex-sans-latin-600-normal.woff'
};

// The package's exports map only its CSS, so look for the files folder from
// the working directory and from this module upwards (source, tsx and build).
function fontDir(): string {
	const tail = join('node_modules', '@fontsource', 'ibm-plex-sans', 'files');
	const starts = [process.cwd(), dirname(fileURLToPath(import.meta.url))];
	for (const start of starts) {
		let dir = resolve(start);
		for (;;) {
			const candidate = join(dir, tail);
			if (existsSync(candidate)) return candidate;
			const up = dirname(dir);
			if (up === dir) break;
			dir = up;
		}
	}
	throw new Error('IBM Plex Sans (@fontsource/ibm-plex-sans) is not installed');
}

/**
 * WOFF 1.0 (W3C) → the plain sfnt (TrueType) it wraps. fontkit reads WOFF
 * too, but inflates every table again for each document; unwrapping once per
 * process makes a sheet several hundred milliseconds faster.
 */
export function woffToSfnt(woff: Buffer): Buffer {
	if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error('not a WOFF file');
	const flavor = woff.readUInt32BE(4);
	const numTables = woff.readUInt16BE(12);
	const tables: { tag: number; checksum: number; data: Buffer }[] = [];
	for (let i = 0; i < numTables; i++) {
		const at = 44 + i * 20;
		const offset = woff.readUInt32BE(at + 4);
		const compLength = woff.readUInt32BE(at + 8);
		const origLength = woff.readUInt32BE(at + 12);
		const raw = woff.subarray(offset, offset + compLength);
		const data = compLength < origLength ? inflateSync(raw) : Buffer.from(raw);
		if (data.length !== origLength) throw new Error('WOFF table length mismatch');
		tables.push({ tag: woff.readUInt32BE(at), checksum: woff.readUInt32BE(at + 16), data });
	}
	let entrySelector = 0;
	while (2 ** (entrySelector + 1) <= numTables) entrySelector++;
	const searchRange = 2 ** entrySelector * 16;
	const headerSize = 12 + 16 * numTables;
	const size = tables.reduce((s, t) => s + ((t.data.length + 3) & ~3), headerSize);
	const out = Buffer.alloc(size);
	out.writeUInt32BE(flavor, 0);
	out.writeUInt16BE(numTables, 4);
	out.writeUInt16BE(searchRange, 6);
	out.writeUInt16BE(entrySelector, 8);
	out.writeUInt16BE(numTables * 16 - searchRange, 10);
	let offset = headerSize;
	tables.forEach((t, i) => {
		const at = 12 + i * 16;
		out.writeUInt32BE(t.tag, at);
		out.writeUInt32BE(t.checksum, at + 4);
		out.writeUInt32BE(offset, at + 8);
		out.writeUInt32BE(t.data.length, at + 12);
		t.data.copy(out, offset);
		offset += (t.data.length + 3) & ~3;
	});
	return out;
}

let fontCache: Record<string, Buffer> | null = null;
export function fonts(): Record<string, Buffer> {
	if (!fontCache) {
		const dir = fontDir();
		fontCache = Object.fromEntries(
			Object.entries(FONT_FILES).map(([name, file]) => [name, woffToSfnt(readFileSync(join(dir, file)))])
		);
	}
	return fontCache;
}

// ── Document ────────────────────────────────────────────────────────────────

export interface TitleInfo {
	sheet: string;
	project: string;
	/** "Revision 3" or "Draft — current patch" */
	revision: string;
	/** ISO date the sheet was printed */
	printed: string;
	signoff: string;
}

export interface SheetDoc {
	doc: Doc;
	/** Content area below the title block and above the footer. */
	top: number;
	bottom: number;
	left: number;
	right: number;
	width: number;
	finish(): Promise<Buffer>;
}

export const MARGIN = 12 * MM;
const TITLE_HEIGHT = 40;
const FOOTER_HEIGHT = 16;

export interface OpenOptions {
	paper: Paper;
	layout?: 'portrait' | 'landscape';
	title: TitleInfo;
	/** Labels print edge to edge of their grid; they get no title block. */
	bare?: boolean;
	margin?: number;
}

export function openSheet(options: OpenOptions): SheetDoc {
	const size = paperSize(options.paper);
	const landscape = options.layout === 'landscape';
	const pageWidth = landscape ? size.height : size.width;
	const pageHeight = landscape ? size.width : size.height;
	const margin = options.margin ?? MARGIN;
	const doc = new PDFDocument({
		size: [pageWidth, pageHeight],
		margin: 0,
		bufferPages: true,
		autoFirstPage: true,
		// no Helvetica: every glyph on the sheet comes from the embedded Plex
		font: null as unknown as string,
		info: {
			Title: `${options.title.project} — ${options.title.sheet} (${options.title.revision})`,
			Author: 'Patchwright',
			Subject: options.title.sheet,
			Creator: 'Patchwright',
			CreationDate: new Date(options.title.printed)
		}
	});
	for (const [name, data] of Object.entries(fonts())) doc.registerFont(name, data);
	doc.font(FONT);
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<Buffer>((res, rej) => {
		doc.on('end', () => res(Buffer.concat(chunks)));
		doc.on('error', rej);
	});
	const top = options.bare ? margin : margin + TITLE_HEIGHT + 8;
	const bottom = options.bare ? pageHeight - margin : pageHeight - margin - FOOTER_HEIGHT;
	return {
		doc,
		top,
		bottom,
		left: margin,
		right: pageWidth - margin,
		width: pageWidth - 2 * margin,
		finish() {
			if (!options.bare) stampPages(doc, options.title, margin, pageWidth, pageHeight);
			doc.end();
			return done;
		}
	};
}

/** "Page n of m" can only be known at the end, so the title block goes on every page last. */
function stampPages(doc: Doc, title: TitleInfo, margin: number, pageWidth: number, pageHeight: number): void {
	const range = doc.bufferedPageRange();
	const width = pageWidth - 2 * margin;
	for (let i = range.start; i < range.start + range.count; i++) {
		doc.switchToPage(i);
		const y = margin;
		doc.save();
		doc.lineWidth(1.2).rect(margin, y, width, TITLE_HEIGHT).stroke('#000');
		doc.font(FONT_BOLD).fontSize(13).fillColor('#000');
		doc.text(title.sheet, margin + 8, y + 6, { lineBreak: false });
		const sheetWidth = doc.widthOfString(title.sheet);
		doc.font(FONT).fontSize(10);
		doc.text(title.project, margin + 16 + sheetWidth, y + 8.5, {
			width: width * 0.62 - sheetWidth - 24,
			height: 14,
			ellipsis: true,
			lineBreak: false
		});
		doc.fontSize(8.5).fillColor('#000');
		doc.text(`${title.revision} · printed ${title.printed.slice(0, 10)}`, margin + 8, y + 25, { lineBreak: false });
		const pageText = pageLabel(i - range.start + 1, range.count);
		doc.font(FONT_BOLD).fontSize(10);
		doc.text(pageText, margin, y + 7, { width: width - 8, align: 'right', lineBreak: false });
		doc.font(FONT).fontSize(8.5);
		doc.text(`Sign-off: ${title.signoff}`, margin + width * 0.38, y + 25, {
			width: width * 0.62 - 8,
			align: 'right',
			height: 11,
			ellipsis: true,
			lineBreak: false
		});
		doc.fontSize(7).fillColor('#444');
		doc.text(`${title.project} · ${title.sheet} · ${title.revision}`, margin, pageHeight - margin - 9, {
			width: width / 2,
			lineBreak: false,
			height: 9,
			ellipsis: true
		});
		doc.text(pageText, margin, pageHeight - margin - 9, { width, align: 'right', lineBreak: false });
		doc.restore();
	}
}

export function pageLabel(n: number, of: number): string {
	return `Page ${n} of ${of}`;
}

// ── Table with a repeated header ────────────────────────────────────────────

export interface Column {
	key: string;
	title: string;
	/** share of the table width */
	width: number;
	align?: 'left' | 'right';
}

export interface Row {
	cells: Record<string, string>;
	/** indent of the first text column (followers under their leader) */
	indent?: number;
	/** bold mark in the left margin: a conflict */
	flag?: boolean;
	bold?: boolean;
}

export interface TableStyle {
	fontSize: number;
	padding: number;
	/** at most this many lines per cell; longer text ends in an ellipsis */
	maxLines: number;
}

export const TABLE_STYLE: TableStyle = { fontSize: 7.5, padding: 2.5, maxLines: 3 };

/** Column widths in points; the last column takes the rounding remainder. */
export function columnWidths(columns: readonly Column[], total: number): number[] {
	const sum = columns.reduce((s, c) => s + c.width, 0);
	const widths = columns.map((c) => Math.floor((c.width / sum) * total * 100) / 100);
	widths[widths.length - 1] = total - widths.slice(0, -1).reduce((s, w) => s + w, 0);
	return widths;
}

/**
 * Lines a cell needs, by a greedy word wrap on the font's advance widths —
 * the same widths pdfkit uses, without laying the text out twice.
 */
export function lineCount(measure: (s: string) => number, text: string, width: number): number {
	if (text === '') return 1;
	let lines = 0;
	for (const paragraph of text.split('\n')) {
		lines++;
		let used = 0;
		for (const word of paragraph.split(' ')) {
			const w = measure(word);
			const space = used === 0 ? 0 : measure(' ');
			if (used > 0 && used + space + w > width) {
				lines++;
				used = w;
			} else used += space + w;
			// a word wider than the cell wraps by characters
			while (used > width && width > 0) {
				lines++;
				used -= width;
			}
		}
	}
	return lines;
}

export interface Cursor {
	y: number;
}

export class Table {
	private widths: number[];
	private lineHeight: number;
	constructor(
		private sheet: SheetDoc,
		private columns: readonly Column[],
		private cursor: Cursor,
		private style: TableStyle = TABLE_STYLE,
		/** drawn again above the header on each continuation page, e.g. "Universe 3 (continued)" */
		private caption?: string,
		/** the column a row's indent applies to */
		private indentKey?: string
	) {
		this.widths = columnWidths(columns, sheet.width);
		sheet.doc.font(FONT).fontSize(style.fontSize);
		this.lineHeight = sheet.doc.currentLineHeight(true);
	}

	rowHeight(row: Row): number {
		const doc = this.sheet.doc;
		doc.font(row.bold ? FONT_BOLD : FONT).fontSize(this.style.fontSize);
		let lines = 1;
		this.columns.forEach((c, i) => {
			const text = row.cells[c.key] ?? '';
			const w = this.widths[i] - 2 * this.style.padding - (c.key === this.indentKey ? (row.indent ?? 0) : 0);
			lines = Math.max(
				lines,
				Math.min(
					this.style.maxLines,
					lineCount((s) => doc.widthOfString(s), text, w)
				)
			);
		});
		return lines * this.lineHeight + 2 * this.style.padding;
	}

	headerHeight(): number {
		return this.lineHeight + 2 * this.style.padding + 1;
	}

	/** Starts the table here; moves to a new page first if not even the header and one row fit. */
	start(firstRowHeight = 0, above = 0): void {
		if (this.cursor.y + above + this.headerHeight() + firstRowHeight > this.sheet.bottom) this.newPage(false);
		this.header();
	}

	private newPage(continued: boolean): void {
		this.sheet.doc.addPage();
		this.cursor.y = this.sheet.top;
		if (continued && this.caption) {
			this.sheet.doc.font(FONT_BOLD).fontSize(9).fillColor('#000');
			this.sheet.doc.text(`${this.caption} (continued)`, this.sheet.left, this.cursor.y, { lineBreak: false });
			this.cursor.y += 14;
		}
	}

	header(): void {
		const doc = this.sheet.doc;
		const y = this.cursor.y;
		const h = this.headerHeight();
		doc.save();
		doc.rect(this.sheet.left, y, this.sheet.width, h).fill('#e4e4e4');
		doc.restore();
		doc.font(FONT_BOLD).fontSize(this.style.fontSize).fillColor('#000');
		let x = this.sheet.left;
		this.columns.forEach((c, i) => {
			doc.text(c.title, x + this.style.padding, y + this.style.padding, {
				width: this.widths[i] - 2 * this.style.padding,
				align: c.align ?? 'left',
				lineBreak: false,
				height: this.lineHeight
			});
			x += this.widths[i];
		});
		doc
			.moveTo(this.sheet.left, y + h)
			.lineTo(this.sheet.right, y + h)
			.lineWidth(0.8)
			.stroke('#000');
		this.cursor.y = y + h;
	}

	row(row: Row): void {
		const doc = this.sheet.doc;
		const h = this.rowHeight(row);
		if (this.cursor.y + h > this.sheet.bottom) {
			this.newPage(true);
			this.header();
		}
		const y = this.cursor.y;
		if (row.flag) {
			// a solid bar and a "!" in the first column: visible in black and white
			doc.save();
			doc.rect(this.sheet.left - 7, y + 1, 4, h - 2).fill('#000');
			doc.restore();
		}
		doc
			.font(row.bold ? FONT_BOLD : FONT)
			.fontSize(this.style.fontSize)
			.fillColor('#000');
		let x = this.sheet.left;
		this.columns.forEach((c, i) => {
			const indent = c.key === this.indentKey ? (row.indent ?? 0) : 0;
			const text = row.cells[c.key] ?? '';
			const width = this.widths[i] - 2 * this.style.padding - indent;
			if (text !== '') {
				// one-line cells skip pdfkit's line wrapper: most cells, most of the time
				const oneLine = !text.includes('\n') && doc.widthOfString(text) <= width;
				doc.text(text, x + this.style.padding + indent, y + this.style.padding, {
					width,
					align: c.align ?? 'left',
					...(oneLine ? { lineBreak: false } : { height: h - 2 * this.style.padding, ellipsis: true })
				});
			}
			x += this.widths[i];
		});
		doc
			.moveTo(this.sheet.left, y + h)
			.lineTo(this.sheet.right, y + h)
			.lineWidth(0.3)
			.stroke('#888');
		this.cursor.y = y + h;
	}
}

/** A heading line; moves to a new page when it and `keep` points after it do not fit. */
export function heading(sheet: SheetDoc, cursor: Cursor, text: string, size = 11, keep = 40): void {
	if (cursor.y + size + 6 + keep > sheet.bottom) {
		sheet.doc.addPage();
		cursor.y = sheet.top;
	}
	sheet.doc.font(FONT_BOLD).fontSize(size).fillColor('#000');
	sheet.doc.text(text, sheet.left, cursor.y, {
		width: sheet.width,
		lineBreak: false,
		height: size * 1.4,
		ellipsis: true
	});
	cursor.y += size * 1.35 + 2;
}

/** Plain wrapped text, moving to a new page when needed. */
export function paragraph(sheet: SheetDoc, cursor: Cursor, text: string, size = 8, bold = false): void {
	const doc = sheet.doc;
	doc
		.font(bold ? FONT_BOLD : FONT)
		.fontSize(size)
		.fillColor('#000');
	const h = doc.heightOfString(text, { width: sheet.width });
	if (cursor.y + h > sheet.bottom) {
		doc.addPage();
		cursor.y = sheet.top;
	}
	doc.text(text, sheet.left, cursor.y, { width: sheet.width });
	cursor.y += h + 2;
}

/** "the-lantern-ferry-river-unit" for file names. */
export function slugify(name: string): string {
	const slug = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 60)
		.replace(/-+$/g, '');
	return slug || 'project';
}
