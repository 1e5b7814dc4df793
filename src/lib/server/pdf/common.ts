import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
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

// IBM Plex Sans as plain TrueType, shipped beside this module under the SIL Open Font Licence
// (fonts/OFL.txt): pdfkit reads it as it is, and subsets it into each PDF.
const FONT_FILES: Record<string, string> = {
	[FONT]: 'IBMPlexSans-Regular.ttf',
	[FONT_BOLD]: 'IBMPlexSans-SemiBold.ttf'
};

/**
 * The fonts folder: beside this file when it runs from source (the PDF worker, tests, scripts);
 * from a bundle, in the app's directory, as the worker file is found (workers/pool.ts).
 */
export function fontDir(): string {
	const beside = join(dirname(fileURLToPath(import.meta.url)), 'fonts');
	return existsSync(beside) ? beside : resolve(process.env.PATCHWRIGHT_APP_DIR || '.', 'src/lib/server/pdf/fonts');
}

let fontCache: Record<string, Buffer> | null = null;
export function fonts(): Record<string, Buffer> {
	if (!fontCache) {
		const dir = fontDir();
		fontCache = Object.fromEntries(
			Object.entries(FONT_FILES).map(([name, file]) => [name, readFileSync(join(dir, file))])
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
/** A dense table sheet: 8 mm margins (office printers leave 4–6 mm unprinted), a lower title block. */
const COMPACT = { margin: 8 * MM, title: 34, footer: 12 };

export interface OpenOptions {
	paper: Paper;
	layout?: 'portrait' | 'landscape';
	title: TitleInfo;
	/** Labels print edge to edge of their grid; they get no title block. */
	bare?: boolean;
	margin?: number;
	/** narrower margins and title block, for the patch sheet's rows */
	compact?: boolean;
}

export function openSheet(options: OpenOptions): SheetDoc {
	const size = paperSize(options.paper);
	const landscape = options.layout === 'landscape';
	const pageWidth = landscape ? size.height : size.width;
	const pageHeight = landscape ? size.width : size.height;
	const margin = options.margin ?? (options.compact ? COMPACT.margin : MARGIN);
	const titleHeight = options.compact ? COMPACT.title : TITLE_HEIGHT;
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
	const top = options.bare ? margin : margin + titleHeight + 6;
	const bottom = options.bare
		? pageHeight - margin
		: pageHeight - margin - (options.compact ? COMPACT.footer : FOOTER_HEIGHT);
	return {
		doc,
		top,
		bottom,
		left: margin,
		right: pageWidth - margin,
		width: pageWidth - 2 * margin,
		finish() {
			if (!options.bare) stampPages(doc, options.title, margin, pageWidth, pageHeight, titleHeight);
			doc.end();
			return done;
		}
	};
}

/** "Page n of m" can only be known at the end, so the title block goes on every page last. */
function stampPages(
	doc: Doc,
	title: TitleInfo,
	margin: number,
	pageWidth: number,
	pageHeight: number,
	TITLE_HEIGHT: number
): void {
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
		const second = y + TITLE_HEIGHT - 15;
		doc.text(`${title.revision} · printed ${title.printed.slice(0, 10)}`, margin + 8, second, { lineBreak: false });
		const pageText = pageLabel(i - range.start + 1, range.count);
		doc.font(FONT_BOLD).fontSize(10);
		doc.text(pageText, margin, y + 7, { width: width - 8, align: 'right', lineBreak: false });
		doc.font(FONT).fontSize(8.5);
		doc.text(`Sign-off: ${title.signoff}`, margin + width * 0.38, second, {
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
	/**
	 * 'wrap' (default): a cell too wide shrinks down to the style's smallest size, then wraps;
	 * 'shrink': it stays on one line and ends in an ellipsis below the smallest size.
	 */
	fit?: 'wrap' | 'shrink';
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
	/** a cell may shrink to this size to stay on one line (no shrinking when absent) */
	minFontSize?: number;
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

export interface CellFit {
	size: number;
	lines: number;
	/** fits on one line at `size` (no wrapping, no ellipsis) */
	oneLine: boolean;
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

	/** The size a cell is drawn at and the lines it takes. */
	cellFit(text: string, width: number, column: Column, bold = false): CellFit {
		const doc = this.sheet.doc;
		const base = this.style.fontSize;
		const min = this.style.minFontSize ?? base;
		doc.font(bold ? FONT_BOLD : FONT).fontSize(base);
		if (text === '') return { size: base, lines: 1, oneLine: true };
		if (!text.includes('\n')) {
			const w = doc.widthOfString(text);
			if (w <= width) return { size: base, lines: 1, oneLine: true };
			// advance widths scale with the size: the largest size that fits, in quarter points
			const size = Math.floor(((base * width) / w) * 4) / 4;
			if (size >= min) return { size, lines: 1, oneLine: true };
			if (column.fit === 'shrink') return { size: min, lines: 1, oneLine: false };
		}
		const lines = Math.min(
			this.style.maxLines,
			lineCount((s) => doc.widthOfString(s), text, width)
		);
		return { size: base, lines, oneLine: false };
	}

	private cellWidth(i: number, row: Row): number {
		const c = this.columns[i];
		return this.widths[i] - 2 * this.style.padding - (c.key === this.indentKey ? (row.indent ?? 0) : 0);
	}

	private fitsOf(row: Row): CellFit[] {
		return this.columns.map((c, i) => this.cellFit(row.cells[c.key] ?? '', this.cellWidth(i, row), c, row.bold));
	}

	rowHeight(row: Row, fits: CellFit[] = this.fitsOf(row)): number {
		const lines = fits.reduce((n, f) => Math.max(n, f.lines), 1);
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
		// each cell measured once, for the row's height and for drawing it
		const fits = this.fitsOf(row);
		const h = this.rowHeight(row, fits);
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
			const width = this.cellWidth(i, row);
			if (text !== '') {
				const fit = fits[i];
				doc.fontSize(fit.size);
				// a smaller size sits on the row's first baseline, not at the top of the cell
				const drop = (this.style.fontSize - fit.size) * 0.75;
				doc.text(text, x + this.style.padding + indent, y + this.style.padding + drop, {
					width,
					align: c.align ?? 'left',
					// one-line cells skip pdfkit's line wrapper: most cells, most of the time
					...(fit.oneLine
						? { lineBreak: false }
						: { height: (fit.lines * this.lineHeight * fit.size) / this.style.fontSize, ellipsis: true })
				});
				doc.fontSize(this.style.fontSize);
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

/**
 * A heading line, with an optional detail in smaller type after it on the same line; moves to a
 * new page when it and `keep` points after it do not fit.
 */
export function heading(sheet: SheetDoc, cursor: Cursor, text: string, size = 11, keep = 40, detail = ''): void {
	if (cursor.y + size + 6 + keep > sheet.bottom) {
		sheet.doc.addPage();
		cursor.y = sheet.top;
	}
	const doc = sheet.doc;
	doc.font(FONT_BOLD).fontSize(size).fillColor('#000');
	const w = Math.min(doc.widthOfString(text), sheet.width);
	doc.text(text, sheet.left, cursor.y, { width: sheet.width, lineBreak: false, height: size * 1.4, ellipsis: true });
	if (detail && w < sheet.width - 40) {
		const small = Math.max(6.5, size - 2.5);
		doc.font(FONT).fontSize(small);
		const dw = sheet.width - w - 10;
		const h = doc.heightOfString(detail, { width: dw });
		doc.text(detail, sheet.left + w + 10, cursor.y + (size - small) * 0.8, { width: dw });
		cursor.y += Math.max(size * 1.35, h + (size - small) * 0.8) + 2;
		return;
	}
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
