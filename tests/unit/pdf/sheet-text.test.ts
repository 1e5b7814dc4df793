import { describe, expect, it } from 'vitest';
import { renderLabelSheet } from '../../../src/lib/server/pdf/label-sheet';
import { renderPatchSheet } from '../../../src/lib/server/pdf/patch-sheet';
import { demoLikePatch, SHEET_TITLE } from '../../helpers/demo-like-patch';
import { pdfPages } from '../../helpers/pdf';

// What the printed sheets say, read back from the PDF as text (pdf.js), for an invented rig like
// the demo's: 30 fixtures on three universes, radio-driven pucks, a linked chain, a mapped puck.

const patch = demoLikePatch();
const byLabel = (label: string) => patch.fixtures.find((f) => f.label === label)!;

async function labelsOf(labels: string[]): Promise<string[]> {
	const pages = await pdfPages(
		await renderLabelSheet(
			patch,
			{ ...SHEET_TITLE, sheet: 'Labels' },
			{ paper: 'a4', baseUrl: 'http://127.0.0.1:3000', projectId: 1, numbers: labels.map((l) => byLabel(l).number) }
		)
	);
	expect(pages.length).toBe(1);
	return [pages[0].text];
}

describe('label sheet', () => {
	it('prints the receiver and every radio channel of an RC fixture, none cut off (issue 19)', async () => {
		const [text] = await labelsOf(['TENDER BOW', 'TENDER PORT']);
		// one word per pdf.js item: compare with the spaces normalised
		const flat = text.replace(/\s+/g, ' ');
		expect(flat).toContain('Tender boat RX');
		expect(flat).toContain('ch 3 intensity, 4 hue, 5 saturation');
		expect(flat).toContain('ch 9 intensity, 10 hue, 11 saturation');
		expect(flat).not.toContain('…');
	});

	it('names the link group and gives a mapped fixture each parameter’s universe.address', async () => {
		const flat = (await labelsOf(['TENDER STBD', 'BANK TUBE 2', 'QUAY PUCK', 'WHEEL 3']))[0].replace(/\s+/g, ' ');
		expect(flat).toContain('Link group TENDER-SIDES');
		expect(flat).toContain('Link group BANK-CHAIN');
		// universe 4 (the rig's third universe): intensity at 20, hue at 30, saturation at 31
		expect(flat).toContain('4.20 intensity · 4.30 hue · 4.31 saturation');
		// a dmx unit is dialled to its start address: WHEEL 3 starts at 1 + 2 × 8
		expect(flat).toContain('1.17');
	});

	it('says the bit depth once: a mode named "HSIC 8-bit" is not followed by "· 8-bit"', async () => {
		const flat = (await labelsOf(['STERN 1', 'WHEEL 1']))[0].replace(/\s+/g, ' ');
		expect(flat).toContain('Skiff Panel 60 · HSIC 8-bit');
		expect(flat).toContain('Skiff Panel 60 · HSIC 16-bit');
		expect(flat).not.toMatch(/8-bit · 8-bit|16-bit · 16-bit/);
	});
});

describe('a crowded label', () => {
	it('keeps all twelve radio channels and the link group of a fixture with a long receiver name', async () => {
		const params = [
			'intensity',
			'hue',
			'saturation',
			'cct',
			'red',
			'green',
			'blue',
			'white',
			'strobe',
			'fan',
			'control',
			'tint'
		];
		const crowded = structuredClone(patch);
		const f = crowded.fixtures.find((x) => x.label === 'TENDER PORT')!;
		f.label = 'BOOM ARM LEFT SIDE HIGH UNIT NUMBER ONE';
		f.linkGroup = 'CRANE-LEFT-PAIR';
		f.control = { kind: 'rc', receiverId: 1, channels: Object.fromEntries(params.map((p, i) => [p, i + 5])) };
		crowded.receivers[0].name = 'Camera crane receiver, operator side';
		const mode = crowded.types.find((t) => t.id === f.typeId)!.modes.find((m) => m.id === f.modeId)!;
		mode.channels = params.map((parameter, i) => ({ offset: i + 1, parameter, bits: 8, default: 0 }));
		const [page] = await pdfPages(
			await renderLabelSheet(
				crowded,
				{ ...SHEET_TITLE, sheet: 'Labels' },
				{ paper: 'letter', baseUrl: 'http://127.0.0.1:3000', projectId: 1, numbers: [f.number] }
			)
		);
		const flat = page.text.replace(/\s+/g, ' ');
		expect(flat).toContain('Camera crane receiver, operator side');
		for (const [i, p] of params.entries()) expect(flat).toContain(`${i + 5} ${p}`);
		expect(flat).toContain('Link group CRANE-LEFT-PAIR');
		expect(flat).toContain('BOOM ARM LEFT SIDE HIGH UNIT NUMBER ONE');
		expect(flat).not.toContain('…');
	});
});

describe('patch sheet', () => {
	const title = { ...SHEET_TITLE, sheet: 'Patch sheet' };

	it('fits 30 demo-like fixtures on one A4 landscape page, each once (issue 19: at least 30 rows a page)', async () => {
		expect(patch.fixtures.length).toBe(30);
		const pages = await pdfPages(await renderPatchSheet(patch, title, 'a4'));
		expect(pages.length).toBe(1);
		// landscape A4 (ISO 216: 297 × 210 mm)
		expect(Math.round(pages[0].width)).toBe(842);
		for (const f of patch.fixtures) expect(pages[0].text).toContain(f.label);
		// a type · mode of 40 characters stays whole on its row
		expect(pages[0].text).toContain('Hollin & Vey Skiff Panel 60 · HSIC 16-bit');
	});

	it('sums up each universe: transport in words, fixtures, slots used and refresh', async () => {
		const flat = (await pdfPages(await renderPatchSheet(patch, title, 'a4')))[0].text.replace(/\s+/g, ' ');
		// universe 1: 12 panels × 8 slots + 2 balls × 2 = 100 slots, highest 100
		expect(flat).toContain('Wired DMX · 14 fixtures · 100 of 512 slots used, highest 100');
		// universe 2: 3 panels × 4 + the linked chain's 4 slots once (41–44) = 16 slots, highest 44
		expect(flat).toContain('Wireless DMX · 6 fixtures · 16 of 512 slots used, highest 44');
		expect(flat).not.toMatch(/dmx-wired|dmx-wireless/);
		// ANSI E1.11: refresh is quoted for the highest slot sent
		expect(flat).toMatch(/refresh up to \d+ Hz/);
	});

	it('lists absolute per-parameter addresses when asked, and a mapped fixture’s always', async () => {
		const offsets = (await pdfPages(await renderPatchSheet(patch, title, 'a4')))[0].text.replace(/\s+/g, ' ');
		expect(offsets).toContain('1/2 intensity · 3/4 hue');
		expect(offsets).toContain('4.20 intensity · 4.30 hue · 4.31 saturation');
		const absolute = (await pdfPages(await renderPatchSheet(patch, title, 'a4', { absolute: true })))[0].text.replace(
			/\s+/g,
			' '
		);
		// WHEEL 3 starts at 1.17 (16-bit: coarse/fine pairs)
		expect(absolute).toContain('1.17/18 intensity · 1.19/20 hue · 1.21/22 saturation · 1.23/24 cct');
		expect(absolute).toContain('Channels (universe.address parameter)');
		expect(absolute).toContain('4.20 intensity · 4.30 hue · 4.31 saturation');
	});
});
