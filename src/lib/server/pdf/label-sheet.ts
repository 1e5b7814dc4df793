import QRCode from 'qrcode';
import type { PatchData } from '../db/patch';
import { FONT, FONT_BOLD, MM, openSheet, pageLabel, paperSize, type Doc, type Paper, type TitleInfo } from './common';
import { lookup, parameterAddresses, rcChannelText, type Lookup } from './patch-sheet';

// One label per fixture, 24 to a page (3 × 8), for the electricians: what the
// unit must be set to, and a QR code that opens the fixture's page on a phone.

type Fixture = PatchData['fixtures'][number];

export interface LabelGrid {
	columns: number;
	rows: number;
	/** label size and top-left of the grid, in points */
	width: number;
	height: number;
	left: number;
	top: number;
}

/** A common 3 × 8 grid: 66 × 34 mm on A4, 66 × 33 mm on US Letter, centred, cut lines between. */
export function labelGrid(paper: Paper): LabelGrid {
	const page = paperSize(paper);
	const width = 66 * MM;
	const height = (paper === 'a4' ? 34 : 33) * MM;
	const columns = 3;
	const rows = 8;
	return {
		columns,
		rows,
		width,
		height,
		left: (page.width - columns * width) / 2,
		top: (page.height - rows * height) / 2
	};
}

export function labelCell(grid: LabelGrid, index: number): { page: number; x: number; y: number } {
	const perPage = grid.columns * grid.rows;
	const slot = index % perPage;
	return {
		page: Math.floor(index / perPage),
		x: grid.left + (slot % grid.columns) * grid.width,
		y: grid.top + Math.floor(slot / grid.columns) * grid.height
	};
}

export interface QrRun {
	row: number;
	col: number;
	length: number;
}

/** Dark modules as horizontal runs: one rectangle per run keeps the vector QR small and fast. */
export function qrRuns(modules: { size: number; get(row: number, col: number): number | boolean }): QrRun[] {
	const runs: QrRun[] = [];
	for (let row = 0; row < modules.size; row++) {
		let start = -1;
		for (let col = 0; col <= modules.size; col++) {
			const dark = col < modules.size && Boolean(modules.get(row, col));
			if (dark && start < 0) start = col;
			if (!dark && start >= 0) {
				runs.push({ row, col: start, length: col - start });
				start = -1;
			}
		}
	}
	return runs;
}

/** Draws a QR code as filled rectangles with a quiet zone of `quiet` modules inside `size`. */
export function drawQr(doc: Doc, text: string, x: number, y: number, size: number, quiet = 2): void {
	const modules = QRCode.create(text, { errorCorrectionLevel: 'M' }).modules;
	const unit = size / (modules.size + 2 * quiet);
	doc.save();
	// in module units, so each rectangle is a few small integers in the content stream
	doc.translate(x + quiet * unit, y + quiet * unit).scale(unit);
	for (const r of qrRuns(modules)) doc.rect(r.col, r.row, r.length, 1);
	doc.fill('#000');
	doc.restore();
}

export function fixtureUrl(baseUrl: string, projectId: number, number: number): string {
	return `${baseUrl.replace(/\/+$/, '')}/projects/${projectId}/fixtures/${number}`;
}

/** The mode's bit depth(s), unless its name already says it ("HSIC 8-bit" needs no "· 8-bit"). */
export function bitDepth(l: Lookup, f: Fixture): string {
	const mode = l.modeById.get(f.modeId);
	if (!mode || /\d+\s*-?\s*bit/i.test(mode.name)) return '';
	const depths = [
		...new Set(mode.channels.filter((c) => c.offset !== null || f.control.kind === 'rc').map((c) => c.bits))
	].sort((a, b) => a - b);
	return depths.length ? `${depths.join('/')}-bit` : '';
}

export interface LabelText {
	number: string;
	label: string;
	/** what gets dialled in on the unit: address(es), or receiver and every radio channel */
	where: string;
	/** model · mode (· bit depth) */
	mode: string;
	source: string;
	/** "Link group BANK-CHAIN", or '' */
	link: string;
}

export function labelText(patch: PatchData, l: Lookup, f: Fixture): LabelText {
	const universes = new Map(patch.universes.map((u) => [u.id, u]));
	const receivers = new Map(patch.receivers.map((r) => [r.id, r]));
	const mode = l.modeById.get(f.modeId);
	const type = l.typeById.get(f.typeId);
	let where: string;
	let source: string;
	const c = f.control;
	switch (c.kind) {
		case 'dmx':
		case 'dmx-map': {
			const u = c.universeId === null ? undefined : universes.get(c.universeId);
			source = c.kind === 'dmx' ? 'DMX' : 'DMX, address per parameter';
			// the start address is what gets dialled in on a dmx unit; a mapped one needs each parameter's slot
			if (!u) where = 'no universe';
			else if (c.kind === 'dmx') {
				// a multi-break mode is dialled in once per break
				const more = (c.breaks ?? []).map(
					(b) => ` · break ${b.dmxBreak} ${universes.get(b.universeId ?? -1)?.number ?? '?'}.${b.address}`
				);
				where = `${u.number}.${c.address}${more.join('')}`;
			} else where = mode ? parameterAddresses(u.number, mode, c) : `${u.number}.?`;
			break;
		}
		case 'rc': {
			const r = c.receiverId === null ? undefined : receivers.get(c.receiverId);
			source = 'RC';
			where = `${r ? r.name : 'no receiver'} · ${rcChannelText(c.channels)}`;
			break;
		}
		case 'follow': {
			const leader = l.fixtureById.get(c.leaderId);
			source = 'follow';
			where = `follows ${leader ? leader.number : '?'}`;
			break;
		}
		default:
			source = 'manual';
			where = 'set on the unit';
	}
	return {
		number: String(f.number),
		label: f.label,
		where,
		mode: [type?.model, mode?.name ?? `mode ${f.modeId}`, bitDepth(l, f)].filter(Boolean).join(' · '),
		source,
		link: f.linkGroup ? `Link group ${f.linkGroup}` : ''
	};
}

/** One text block of a label, in the size it is drawn at. */
export interface LabelLine {
	text: string;
	font: string;
	size: number;
	/** lines it may take before it ends in an ellipsis */
	height: number;
}

/**
 * Fits a label's text into its box: the number, the label, what to dial in, then the link group,
 * the mode and the input. Everything shrinks step by step (the dial-in text from 9 pt to 5.5 pt)
 * before anything is left out; then whole detail lines give way from the end (input first, the
 * link group last), never the dial-in text.
 */
export function layoutLabel(doc: Doc, t: LabelText, width: number, height: number): LabelLine[] {
	const measure = (text: string, font: string, size: number) => {
		doc.font(font).fontSize(size);
		return doc.heightOfString(text, { width });
	};
	const details = [t.link, t.mode, `Input: ${t.source}`].filter(Boolean);
	const steps: [number, number, number, number][] = [
		// [number size, label size, dial-in size, details size]
		[18, 8.5, 9, 6.5],
		[18, 8, 8, 6],
		[16, 7.5, 7, 6],
		[16, 7, 6.5, 5.5],
		[14, 6.5, 6, 5.5],
		[14, 6, 5.5, 5]
	];
	let out: LabelLine[] = [];
	for (const [numberSize, labelSize, whereSize, detailSize] of steps) {
		out = [
			{ text: t.number, font: FONT_BOLD, size: numberSize, height: numberSize * 1.25 },
			{ text: t.label, font: FONT_BOLD, size: labelSize, height: measure(t.label, FONT_BOLD, labelSize) + 1 },
			{ text: t.where, font: FONT_BOLD, size: whereSize, height: measure(t.where, FONT_BOLD, whereSize) + 1 },
			...details.map((text) => ({ text, font: FONT, size: detailSize, height: measure(text, FONT, detailSize) }))
		];
		if (out.reduce((sum, line) => sum + line.height, 0) <= height) return out;
	}
	// still too much at the smallest sizes: the label keeps two lines, details go from the end
	out[1].height = Math.min(out[1].height, 2 * doc.font(FONT_BOLD).fontSize(out[1].size).currentLineHeight(true) + 1);
	while (out.length > 3 && out.reduce((sum, line) => sum + line.height, 0) > height) out.pop();
	return out;
}

export interface LabelOptions {
	paper: Paper;
	baseUrl: string;
	projectId: number;
	/** fixture numbers; all fixtures when absent */
	numbers?: readonly number[];
}

export async function renderLabelSheet(patch: PatchData, title: TitleInfo, options: LabelOptions): Promise<Buffer> {
	const grid = labelGrid(options.paper);
	const sheet = openSheet({ paper: options.paper, title, bare: true, margin: 0 });
	const doc = sheet.doc;
	const l = lookup(patch);
	const wanted = options.numbers ? new Set(options.numbers) : null;
	const list = patch.fixtures.filter((f) => !wanted || wanted.has(f.number)).sort((a, b) => a.number - b.number);
	const perPage = grid.columns * grid.rows;
	const pages = Math.max(1, Math.ceil(list.length / perPage));
	const pad = 2.5 * MM;
	// 24 mm: about 0.7 mm a module for a fixture URL, still an easy read for a phone camera,
	// and it leaves the text a third more width than a full-height code did
	const qr = 24 * MM;
	const textW = grid.width - qr - pad - 2 * MM;

	const frame = (p: number) => {
		// dashed cut lines along the grid, and what the sheet is in the bottom margin
		doc.save();
		doc.lineWidth(0.4).dash(2, { space: 2 }).strokeColor('#999');
		for (let c = 0; c <= grid.columns; c++) {
			const x = grid.left + c * grid.width;
			doc.moveTo(x, grid.top - 4 * MM).lineTo(x, grid.top + grid.rows * grid.height + 4 * MM);
		}
		for (let r = 0; r <= grid.rows; r++) {
			const y = grid.top + r * grid.height;
			doc.moveTo(grid.left - 4 * MM, y).lineTo(grid.left + grid.columns * grid.width + 4 * MM, y);
		}
		doc.stroke();
		doc.undash();
		doc.restore();
		doc.font(FONT).fontSize(6.5).fillColor('#000');
		const footerY = grid.top + grid.rows * grid.height + (grid.top - 6.5) / 2 - 2;
		doc.text(
			`${title.project} · Labels · ${title.revision} · printed ${title.printed.slice(0, 10)}`,
			grid.left,
			footerY,
			{
				width: grid.columns * grid.width,
				lineBreak: false
			}
		);
		doc.text(pageLabel(p + 1, pages), grid.left, footerY, {
			width: grid.columns * grid.width,
			align: 'right',
			lineBreak: false
		});
	};

	frame(0);
	list.forEach((f, i) => {
		const cell = labelCell(grid, i);
		if (i > 0 && i % perPage === 0) {
			doc.addPage();
			frame(cell.page);
		}
		const t = labelText(patch, l, f);
		const x = cell.x + pad;
		let y = cell.y + pad - 1;
		for (const line of layoutLabel(doc, t, textW, grid.height - 2 * pad + 2)) {
			doc.fillColor('#000').font(line.font).fontSize(line.size);
			if (line.height > 0) doc.text(line.text, x, y, { width: textW, height: line.height, ellipsis: true, lineGap: 0 });
			y += line.height;
		}
		drawQr(
			doc,
			fixtureUrl(options.baseUrl, options.projectId, f.number),
			cell.x + grid.width - qr - 1 * MM,
			cell.y + (grid.height - qr) / 2,
			qr
		);
	});
	return sheet.finish();
}
