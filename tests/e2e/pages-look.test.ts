import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { hydrated, newPage, screenshot, signIn } from './helpers';
import { demoStage } from './launch';

// Screenshots of the building-block pages (issue 16) at the programmer's desk (1440×900) and the
// electrician's phone (390×844), light and dark, to be looked at; each asserts the page drew.

const stage = demoStage();

async function theme(page: Page, value: 'light' | 'dark') {
	await page.context().addCookies([{ name: 'pw-theme', value, url: stage.server.url }]);
}

const SIZES = [
	{ name: 'desk', width: 1440, height: 900, mobile: false },
	{ name: 'phone', width: 390, height: 844, mobile: true }
] as const;

describe('building-block pages, looked at', () => {
	it('types (with the editor open), universes and radio in both sizes and themes', async () => {
		const pid = demoProjectId(stage.server.db());
		for (const size of SIZES) {
			for (const mode of ['light', 'dark'] as const) {
				const page = await newPage(stage.browser, size.width, size.height, size.mobile);
				await theme(page, mode);
				await signIn(page, stage.server.url, 'programmer@demo.test');
				await page.goto(`${stage.server.url}/projects/${pid}/types`);
				await hydrated(page);
				const edit = page.getByRole('button', { name: /^Edit / }).first();
				await edit.click();
				await page.getByRole('button', { name: 'Save type' }).waitFor();
				expect(await page.locator('[data-slot-count]').count()).toBeGreaterThan(0);
				await screenshot(page, `types-${size.name}-${mode}`);
				// the editor as the eye meets it: one screen, scrolled to the first mode
				await page.locator('[data-mode="1"]').first().scrollIntoViewIfNeeded();
				await page.screenshot({ path: `test-results/screenshots/types-editor-${size.name}-${mode}.png` });
				await page.goto(`${stage.server.url}/projects/${pid}/universes`);
				await page.getByRole('heading', { name: 'Universes' }).waitFor();
				await screenshot(page, `universes-${size.name}-${mode}`);
				await page.goto(`${stage.server.url}/projects/${pid}/radio`);
				await page.getByRole('heading', { level: 1 }).waitFor();
				await screenshot(page, `radio-${size.name}-${mode}`);
				// a restore preview of the demo's own backup; nothing is created by choosing the file
				const backup = await (await page.request.get(`${stage.server.url}/api/projects/${pid}/export.json`)).body();
				await page.goto(`${stage.server.url}/projects/${pid}/import`);
				await hydrated(page);
				await page.setInputFiles('#restore-file', { name: 'demo.json', mimeType: 'application/json', buffer: backup });
				await page.getByTestId('restore-preview').getByText('(restored').waitFor();
				await page.getByTestId('restore-preview').scrollIntoViewIfNeeded();
				await page.screenshot({ path: `test-results/screenshots/restore-preview-${size.name}-${mode}.png` });
				await page.close();
			}
		}
	});
});
