import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import jsQR from 'jsqr';
import { PNG } from 'pngjs';

// Reading our PDFs back the way a person would: text through pdf.js, pixels
// through poppler's pdftoppm, QR codes through jsQR.

export interface PdfPage {
	text: string;
	width: number;
	height: number;
}

export async function pdfPages(data: Uint8Array): Promise<PdfPage[]> {
	const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
	const doc = await pdfjs.getDocument({
		data: new Uint8Array(data),
		disableFontFace: true,
		useSystemFonts: false,
		verbosity: 0
	}).promise;
	const pages: PdfPage[] = [];
	for (let i = 1; i <= doc.numPages; i++) {
		const page = await doc.getPage(i);
		const content = await page.getTextContent();
		const [, , width, height] = page.view;
		pages.push({
			text: content.items.map((it) => ('str' in it ? it.str : '')).join(' '),
			width,
			height
		});
	}
	await doc.destroy();
	return pages;
}

export async function pdfInfo(data: Uint8Array): Promise<Record<string, unknown>> {
	const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
	const doc = await pdfjs.getDocument({ data: new Uint8Array(data), verbosity: 0 }).promise;
	const meta = await doc.getMetadata();
	await doc.destroy();
	return meta.info as Record<string, unknown>;
}

/**
 * One page as a PNG at `dpi`, rendered by pdftoppm. Asynchronous on purpose: a
 * blocked event loop misses the server closing idle keep-alive sockets, and the
 * next request then fails on a dead one.
 */
export async function renderPage(data: Uint8Array, page: number, dpi: number): Promise<PNG> {
	const dir = mkdtempSync(join(tmpdir(), 'patchwright-pdf-'));
	try {
		const file = join(dir, 'in.pdf');
		writeFileSync(file, data);
		await promisify(execFile)('pdftoppm', [
			'-r',
			String(dpi),
			'-png',
			'-f',
			String(page),
			'-l',
			String(page),
			'-singlefile',
			file,
			join(dir, 'out')
		]);
		return PNG.sync.read(readFileSync(join(dir, 'out.png')));
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

/** Decodes the QR code inside a rectangle (pixels) of a rendered page, or null. */
export function decodeQr(png: PNG, x: number, y: number, w: number, h: number): string | null {
	const x0 = Math.max(0, Math.floor(x));
	const y0 = Math.max(0, Math.floor(y));
	const cw = Math.min(png.width - x0, Math.ceil(w));
	const ch = Math.min(png.height - y0, Math.ceil(h));
	const out = new Uint8ClampedArray(cw * ch * 4);
	for (let row = 0; row < ch; row++) {
		const from = ((y0 + row) * png.width + x0) * 4;
		out.set(png.data.subarray(from, from + cw * 4), row * cw * 4);
	}
	return jsQR(out, cw, ch)?.data ?? null;
}
