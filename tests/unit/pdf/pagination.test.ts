import { describe, expect, it } from 'vitest';
import { renderPatchSheet } from '../../../src/lib/server/pdf/patch-sheet';
import { bigPatch } from '../../helpers/big-patch';
import { pdfPages } from '../../helpers/pdf';

describe('a 2,000-fixture patch sheet', () => {
	it('breaks across pages with the column header and the title block on every page', async () => {
		const patch = bigPatch(2000);
		const title = {
			sheet: 'Patch sheet',
			project: 'Bench rig',
			revision: 'Revision 7',
			printed: '2026-05-01T09:00:00.000Z',
			signoff: 'r7 not signed off'
		};
		const pages = await pdfPages(await renderPatchSheet(patch, title, 'a4'));
		expect(pages.length).toBeGreaterThan(40);
		pages.forEach((p, i) => {
			expect(p.text).toContain('Patch sheet');
			expect(p.text).toContain('Bench rig');
			expect(p.text).toContain('Revision 7');
			expect(p.text).toContain(`Page ${i + 1} of ${pages.length}`);
			// the header row, repeated; the first page opens with the conflict summary and the first universe
			expect(p.text).toMatch(/Address\s+No\.\s+Label\s+Type · mode/);
			// landscape A4 (ISO 216: 297 × 210 mm)
			expect(Math.round(p.width)).toBe(842);
		});
		// every fixture made it onto a page, each once, with its address
		const all = pages.map((p) => p.text).join(' ');
		for (const f of patch.fixtures) {
			const u = patch.universes.find((x) => f.control.kind === 'dmx' && x.id === f.control.universeId)!;
			expect(all).toContain(`${u.number}.${f.slots[0].start}–${f.slots[0].end}`);
		}
		expect(all.match(/BENCH \d+\b/g)!.length).toBe(2000);
		// a continuation page names the universe it continues
		expect(all).toContain('(continued)');
	}, 60_000);
});
