import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { demoStage, screenshot, signInPage } from './launch';

// Issue 16: a programmer sets up a project's building blocks from the pages alone, and the
// owner (here the same person, who created the project) renames and deletes it.
const stage = demoStage();

async function nav(page: Page, name: string) {
	await page.getByRole('navigation', { name: 'Project sections' }).getByRole('link', { name, exact: true }).click();
	await page.waitForURL(new RegExp(`/${name.toLowerCase()}$`));
}

/** The page at desk and phone size, light and dark. */
async function shots(page: Page, name: string) {
	const url = page.url();
	for (const theme of ['light', 'dark'] as const) {
		await page.context().addCookies([{ name: 'pw-theme', value: theme, url: stage.server.url }]);
		for (const [w, h] of [
			[1440, 900],
			[390, 844]
		] as const) {
			await page.setViewportSize({ width: w, height: h });
			await page.goto(url);
			await screenshot(page, `${name}-${w}-${theme}`);
		}
	}
	await page.setViewportSize({ width: 1440, height: 900 });
	await page.context().addCookies([{ name: 'pw-theme', value: 'light', url: stage.server.url }]);
	await page.goto(url);
}

describe('building a project from the pages (Chromium)', () => {
	it('universes, a type with two modes, a receiver with labels, settings, delete', async () => {
		const page = await stage.browser.page({ width: 1440, height: 900 });
		const base = stage.server.url;
		await signInPage(page, base, 'programmer@demo.test');
		await page.getByRole('button', { name: 'New project' }).click();
		await page.getByLabel('Name').fill('Harbour night shoot');
		await page.getByRole('button', { name: 'Create project' }).click();
		await page.waitForURL(/\/projects\/\d+$/);
		const pid = Number(/\/projects\/(\d+)$/.exec(page.url())![1]);

		// universes: add, refuse an empty and a duplicate number at the field with the input kept
		await nav(page, 'Universes');
		const add = page.locator('form[action="?/create"]');
		await add.getByLabel('Name').fill('Deck');
		await add.getByRole('button', { name: 'Add universe' }).click();
		await page.locator('[data-universe="1"]').waitFor();
		await add.getByLabel('Number').fill('1');
		await add.getByLabel('Name').fill('Stern');
		await add.getByRole('button', { name: 'Add universe' }).click();
		await expect.poll(() => add.textContent()).toContain('Universe 1 already exists.');
		expect(await add.getByLabel('Name').inputValue()).toBe('Stern');
		await screenshot(page, 'universes-duplicate');
		await add.getByLabel('Number').fill('');
		await add.getByRole('button', { name: 'Add universe' }).click();
		await expect.poll(() => add.textContent()).toContain('Number is required.');
		expect(await add.getByLabel('Name').inputValue()).toBe('Stern');
		await add.getByLabel('Number').fill('2');
		await add.getByRole('button', { name: 'Add universe' }).click();
		await page.locator('[data-universe="2"]').waitFor();

		// rename universe 1, change its transport and node notes
		const u1 = page.locator('[data-universe="1"]');
		await u1.getByRole('button', { name: 'Edit universe 1' }).click();
		await u1.getByLabel('Name').fill('Foredeck');
		await u1.getByLabel('Transport').selectOption('sacn');
		await u1.getByLabel('Node / port notes').fill('node 2 port A');
		await u1.getByRole('button', { name: 'Save universe 1' }).click();
		await expect.poll(() => u1.textContent()).toContain('Foredeck');
		expect(await u1.textContent()).toContain('sACN');
		expect(await u1.textContent()).toContain('node 2 port A');

		// a type with two modes, then the same maker + model again, refused
		await nav(page, 'Types');
		await page.getByLabel('Maker').fill('Lumenkraft');
		await page.getByLabel('Model').fill('Bar 4');
		await page.getByLabel('Mode name').first().fill('Basic');
		await page.getByRole('button', { name: 'Add mode' }).click();
		await page.getByLabel('Mode name').nth(1).fill('Extended');
		await page.getByRole('button', { name: 'Add channel' }).nth(1).click();
		await page.getByLabel('Parameter').nth(2).fill('cct');
		await page.getByRole('button', { name: 'Save type' }).click();
		await page.getByRole('heading', { name: 'Lumenkraft Bar 4' }).waitFor();
		await page.getByLabel('Maker').fill('lumenkraft');
		await page.getByLabel('Model').fill('BAR 4');
		await page.getByLabel('Mode name').first().fill('Basic');
		await page.getByRole('button', { name: 'Save type' }).click();
		await expect
			.poll(() => page.getByRole('alert').first().textContent())
			.toContain('Lumenkraft Bar 4 is already a fixture type');
		await screenshot(page, 'types-duplicate');

		// a fixture on universe 1 (the patch table is another page's job; this one call stands in for it)
		const types = (await (await page.request.get(`${base}/api/projects/${pid}/types`)).json()) as {
			types: { id: number; modes: { id: number }[] }[];
		};
		const universes = (await (await page.request.get(`${base}/api/projects/${pid}/universes`)).json()) as {
			universes: { id: number; number: number }[];
		};
		const created = await page.request.post(`${base}/api/projects/${pid}/fixtures`, {
			data: {
				number: 101,
				label: 'Bow wash',
				typeId: types.types[0].id,
				modeId: types.types[0].modes[0].id,
				control: { kind: 'dmx', universeId: universes.universes.find((u) => u.number === 1)!.id, address: 1 }
			},
			headers: { origin: base }
		});
		expect(created.status()).toBe(201);

		// deleting a universe in use names the fixture and offers to set it to manual
		await nav(page, 'Universes');
		await u1.getByRole('button', { name: 'Delete universe 1' }).click();
		const dialog = page.getByRole('dialog');
		await expect.poll(() => dialog.textContent()).toContain('101 Bow wash');
		await screenshot(page, 'universes-delete-dialog');
		await dialog.getByRole('button', { name: 'Set them to manual and delete' }).click();
		await expect.poll(() => page.locator('[data-universe="1"]').count()).toBe(0);
		const fixture = (await (await page.request.get(`${base}/api/projects/${pid}/fixtures`)).json()) as {
			fixtures: { number: number; control: { kind: string } }[];
		};
		expect(fixture.fixtures.find((f) => f.number === 101)!.control.kind).toBe('manual');

		// a receiver with a channel label, renamed, then deleted
		await nav(page, 'Radio');
		const rxAdd = page.locator('form[action="?/create"]');
		await rxAdd.getByLabel('Name').fill('Car RX');
		await rxAdd.getByRole('button', { name: 'Add receiver' }).click();
		const rx = page.locator('[data-receiver="Car RX"]');
		await rx.waitFor();
		await rx.getByRole('button', { name: 'Edit receiver Car RX' }).click();
		await rx.getByLabel('Label of channel 1').fill('left stick up/down');
		await rx.getByLabel('Label of channel 5').fill('right knob');
		await rx.getByLabel('Name').fill('Car RX A');
		await rx.getByRole('button', { name: 'Save receiver' }).click();
		const rxA = page.locator('[data-receiver="Car RX A"]');
		await rxA.waitFor();
		expect(await rxA.locator('[data-channel="1"]').textContent()).toContain('left stick up/down');
		expect(await rxA.locator('[data-channel="5"]').textContent()).toContain('right knob');
		await rxA.getByRole('button', { name: 'Preview auto-assign' }).click();
		await rxA.getByTestId('assign-preview').waitFor();
		await shots(page, 'radio');
		await page.locator('[data-receiver="Car RX A"]').getByRole('button', { name: 'Delete receiver Car RX A' }).click();
		await page.getByRole('dialog').getByRole('button', { name: 'Delete receiver' }).click();
		await expect.poll(() => page.locator('[data-receiver]').count()).toBe(0);

		await nav(page, 'Universes');
		await shots(page, 'universes');

		// the owner's settings: dates out of order are refused with a sentence, then it is renamed and deleted
		await nav(page, 'Settings');
		await page.getByLabel('Name').fill('Harbour night shoot, week 2');
		await page.getByLabel('First day').fill('2027-03-10');
		await page.getByLabel('Last day').fill('2027-03-08');
		await page.getByRole('button', { name: 'Save settings' }).click();
		await expect
			.poll(() => page.locator('main, body').first().textContent())
			.toContain('The last day cannot be before the first day.');
		expect(await page.getByLabel('Name').inputValue()).toBe('Harbour night shoot, week 2');
		await screenshot(page, 'settings-dates-refused');
		await page.getByLabel('Last day').fill('2027-03-12');
		await page.getByRole('button', { name: 'Save settings' }).click();
		await expect.poll(() => page.getByRole('status').first().textContent()).toContain('Project settings saved.');
		await shots(page, 'settings');
		expect(await page.getByRole('navigation', { name: 'Project sections' }).textContent()).toContain('Settings');
		await page.getByLabel('Type the project name to confirm').fill('Harbour night shoot, week 2');
		await page.getByRole('button', { name: 'Delete project' }).click();
		await page.waitForURL((u) => u.pathname === '/');
		expect((await page.request.get(`${base}/api/projects/${pid}`)).status()).toBe(404);
		await page.close();
	});

	it('a programmer of the demo sees no Settings section; the settings page refuses them', async () => {
		const page = await stage.browser.page();
		await signInPage(page, stage.server.url, 'programmer@demo.test');
		await page.getByTestId('project-list').getByRole('link').first().click();
		await page.getByRole('navigation', { name: 'Project sections' }).waitFor();
		expect(await page.getByRole('navigation', { name: 'Project sections' }).textContent()).not.toContain('Settings');
		const res = await page.goto(page.url() + '/settings');
		expect(res?.status()).toBe(403);
		await page.close();
	});
});
