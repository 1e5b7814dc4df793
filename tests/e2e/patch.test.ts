import { beforeAll, describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { newPage, patchRows, screenshot, signIn } from './helpers';
import { demoStage } from './launch';

// The table-centred client, one story per role (DESIGN.md "Roles", "Pages").

const stage = demoStage();
let pid: number;

beforeAll(() => {
	pid = demoProjectId(stage.server.db());
});

describe('patch pages in the browser', () => {
	it('a programmer creates a universe, adds overlapping fixtures, sees the overlap on the row and the map, and fixes it with auto-address', async () => {
		const page = await newPage(stage.browser);
		await signIn(page, stage.server.url, 'programmer@demo.test');

		await page.goto(`${stage.server.url}/projects/${pid}/universes`);
		await page.getByLabel('Number').fill('9');
		await page.getByLabel('Name').fill('Test barge');
		await page.getByRole('button', { name: 'Add universe' }).click();
		await page.getByRole('link', { name: /^9 Test barge/ }).waitFor();
		await screenshot(page, 'universes-index');

		await page.goto(`${stage.server.url}/projects/${pid}/patch`);
		await patchRows(page);
		// the table is windowed: show only the new universe so new rows are drawn
		await page.getByRole('search').getByLabel('Universe').selectOption({ label: '9 Test barge' });
		await page.getByText('Add fixtures').click();
		const form = page.locator('form', { has: page.getByRole('button', { name: 'Add', exact: true }) });
		const modeLabel = await form
			.locator('select')
			.first()
			.locator('option', { hasText: 'HSIC 8-bit' })
			.first()
			.textContent();
		expect(modeLabel).toMatch(/\(4\)$/); // the demo's 4-slot HSIC 8-bit mode
		for (const [label, address] of [
			['BARGE A', '1'],
			['BARGE B', '3']
		]) {
			await form.getByLabel('Type · mode').selectOption({ label: modeLabel! });
			await form.getByLabel('Label').fill(label);
			await form.getByLabel('Universe').selectOption({ label: '9 Test barge' });
			await form.getByLabel('Start address').fill(address);
			await form.getByRole('button', { name: 'Add', exact: true }).click();
			await page.locator('[data-notice]', { hasText: 'Added 1 fixture' }).waitFor();
			await page.locator('[data-row]', { hasText: label }).waitFor();
		}

		await expect.poll(() => page.locator('[data-row]').count()).toBe(2);
		const conflictCells = page.locator('[data-row] [data-col="conflicts"]');
		expect(await conflictCells.nth(0).textContent()).toContain('overlap');
		expect(await conflictCells.nth(1).textContent()).toContain('overlap');
		expect(await page.locator('[data-conflict-list]').textContent()).toMatch(/Overlap.*slots 3–4 of universe 9/);
		await screenshot(page, 'patch-overlap');

		await page.goto(`${stage.server.url}/projects/${pid}/universes/9`);
		expect(await page.locator('[data-overlap]').count()).toBe(2);
		expect(await page.locator('[data-slot="3"]').getAttribute('aria-label')).toMatch(/OVERLAP/);
		await screenshot(page, 'universe-overlap');

		await page.goto(`${stage.server.url}/projects/${pid}/patch`);
		await patchRows(page);
		await page.getByRole('search').getByLabel('Universe').selectOption({ label: '9 Test barge' });
		await expect.poll(() => page.locator('[data-row]').count()).toBe(2);
		await page.getByLabel('Select all shown').check();
		await page.getByRole('button', { name: 'Auto-address…' }).click();
		const dialog = page.getByRole('dialog');
		await dialog.getByLabel('Universe').selectOption({ label: '9 Test barge' });
		await dialog.getByLabel('Start address').fill('1');
		await dialog.getByRole('button', { name: 'Preview' }).click();
		const preview = dialog.locator('[data-preview]');
		await preview.waitFor();
		expect(await preview.textContent()).toContain('9.1');
		expect(await preview.textContent()).toContain('9.5');
		await screenshot(page, 'autoaddress-preview');
		await dialog.getByRole('button', { name: 'Apply' }).click();
		await page.locator('[data-notice]', { hasText: 'Placed 2' }).waitFor();
		await expect.poll(() => conflictCells.nth(1).textContent()).toBe('');
		expect(
			await page.locator('[data-row]', { hasText: 'BARGE B' }).locator('[data-col="control"]').textContent()
		).toContain('9.5');

		await page.goto(`${stage.server.url}/projects/${pid}/universes/9`);
		expect(await page.locator('[data-overlap]').count()).toBe(0);
	});

	it('an electrician on a phone marks a fixture addressed and the table shows it', async () => {
		const page = await newPage(stage.browser, 390, 844, true);
		await signIn(page, stage.server.url, 'electrician@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/fixtures/106`);
		expect(await page.locator('[data-state]').textContent()).toContain('planned');
		expect(await page.locator('[data-address]').textContent()).toBe('41');
		const button = page.getByRole('button', { name: 'addressed' });
		const box = await button.boundingBox();
		expect(box!.height).toBeGreaterThanOrEqual(44); // tap target, WCAG 2.5.5
		await button.click();
		await page.locator('[data-state="addressed"]').waitFor();
		await screenshot(page, 'fixture-phone');
		// no editing of the patch itself for an electrician
		await page.goto(`${stage.server.url}/projects/${pid}/patch`);
		await patchRows(page);
		expect(await page.getByText('Add fixtures').count()).toBe(0);
		await page.getByLabel('Search').fill('WHEEL 6');
		await expect.poll(() => page.locator('[data-row]').count()).toBe(1);
		expect(await page.locator('[data-row="106"] [data-col="state"]').textContent()).toContain('addressed');
		await screenshot(page, 'patch-phone');
	});

	it('a viewer sees no edit controls, and an edit through the API is refused', async () => {
		const page = await newPage(stage.browser);
		await signIn(page, stage.server.url, 'viewer@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/patch`);
		await patchRows(page);
		expect(await page.locator('[data-row] input[type=checkbox]').count()).toBe(0);
		expect(await page.getByText('Add fixtures').count()).toBe(0);
		await page.goto(`${stage.server.url}/projects/${pid}/fixtures/101`);
		expect(await page.getByRole('button', { name: 'checked' }).count()).toBe(0);
		expect(await page.getByRole('button', { name: 'Upload photo' }).count()).toBe(0);
		await page.goto(`${stage.server.url}/projects/${pid}/types`);
		expect(await page.getByText('Add a fixture type').count()).toBe(0);

		const viewer = await stage.server.signIn('viewer@demo.test');
		const patch = (await (await viewer.get(`/api/projects/${pid}/patch`)).json()) as {
			fixtures: { id: number; number: number; version: number }[];
		};
		const f = patch.fixtures.find((x) => x.number === 101)!;
		const res = await viewer.patch(`/api/projects/${pid}/fixtures/${f.id}`, { state: 'fault', version: f.version });
		expect(res.status).toBe(403);
	});

	it('every page renders: screenshots for review', async () => {
		const page = await newPage(stage.browser);
		await signIn(page, stage.server.url, 'programmer@demo.test');
		for (const [path, name] of [
			['', 'overview'],
			['/patch', 'patch'],
			['/universes/3', 'universe-map'],
			['/radio', 'radio'],
			['/types', 'types'],
			['/fixtures/101', 'fixture']
		]) {
			await page.goto(`${stage.server.url}/projects/${pid}${path}`);
			if (path === '/patch') await patchRows(page);
			expect(await page.locator('h1').first().textContent()).toBeTruthy();
			await screenshot(page, `page-${name}`);
		}
		const phone = await newPage(stage.browser, 360, 780, true);
		await signIn(phone, stage.server.url, 'programmer@demo.test');
		for (const [path, name] of [
			['/universes/3', 'universe-map-360'],
			['/types', 'types-360']
		]) {
			await phone.goto(`${stage.server.url}/projects/${pid}${path}`);
			const overflow = await phone.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
			expect(overflow).toBeLessThanOrEqual(0); // works at 360 px wide
			await screenshot(phone, `page-${name}`);
		}
	});
});
