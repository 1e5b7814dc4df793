import { describe, expect, it } from 'vitest';
import { gdtfZip } from '../helpers/gdtf';
import { demoStage, screenshot, signInPage } from './launch';

const stage = demoStage();

describe('the import / export page (Chromium)', () => {
	it('a programmer previews a GDTF type, applies it, and sees a bad CSV row named', async () => {
		const page = await stage.browser.page();
		await signInPage(page, stage.server.url, 'programmer@demo.test');
		await page.getByTestId('project-list').getByRole('link').first().click();
		await page.getByRole('link', { name: 'Import / export' }).click();
		await page.waitForURL(/\/import$/);

		const gdtf = page.getByTestId('import-panel').nth(1);
		await gdtf
			.locator('input[type=file]')
			.setInputFiles({ name: 'tidepanel.gdtf', mimeType: 'application/octet-stream', buffer: Buffer.from(gdtfZip()) });
		await expect
			.poll(() => gdtf.getByTestId('import-summary').textContent())
			.toContain('Harbourlight Works Tidepanel One');
		// DESIGN "Mode": 1,2 (16-bit) and 5 → 5 slots
		expect(await gdtf.getByRole('row', { name: /HSI 16/ }).textContent()).toContain('5');
		await gdtf.getByRole('button', { name: 'Apply' }).click();
		await expect.poll(() => gdtf.getByRole('status').textContent()).toContain('Imported.');

		const csv = page.getByTestId('import-panel').nth(0);
		const text =
			'number,maker,model,mode,universe,address\n901,Harbourlight Works,Tidepanel One,Basic 8,9,1\n902,Harbourlight Works,Tidepanel One,No such mode,9,3\n';
		await csv
			.locator('input[type=file]')
			.setInputFiles({ name: 'patch.csv', mimeType: 'text/csv', buffer: Buffer.from(text) });
		await expect.poll(() => csv.getByTestId('import-issues').textContent()).toContain('has no mode "No such mode"');
		expect(await csv.getByTestId('import-issues').locator('tbody td').first().textContent()).toBe('3');
		await screenshot(page, 'import-page');
		await page.close();
	});
});
