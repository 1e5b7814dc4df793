import { and, eq, inArray } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoProjectId } from '../helpers/revisions';
import { newPage, patchRows, screenshot, signIn } from './helpers';
import { demoStage } from './launch';
import { fixtures } from '../../src/lib/server/db/schema';

// The patch table's bulk tools as a programmer uses them, at a desk and on a phone (issue 18),
// and the radio page following someone else's change without a reload.

const stage = demoStage();
let pid: number;

beforeAll(() => {
	pid = demoProjectId(stage.server.db());
});

async function openPatch(page: Page, theme?: string) {
	if (theme) await page.context().addCookies([{ name: 'pw-theme', value: theme, url: stage.server.url }]);
	await signIn(page, stage.server.url, 'programmer@demo.test');
	await page.goto(`${stage.server.url}/projects/${pid}/patch`);
	await patchRows(page);
}

/** Rows that match the filters (the grid draws only a window of them). */
const shown = async (page: Page) =>
	Number((await page.getByText(/^\d+ of \d+ fixtures shown/).textContent())?.match(/^(\d+)/)?.[1]);

const rowNumbers = (page: Page) =>
	page.locator('[data-row]').evaluateAll((rows) => rows.map((r) => Number((r as HTMLElement).dataset.row)));

describe('bulk tools at a desk', () => {
	it('adds 30 fixtures numbered 601–630 labelled DECK {n}, after being told how many fit from 505', async () => {
		const page = await newPage(stage.browser, 1440, 900);
		await openPatch(page);
		await page.getByText('Add fixtures').click();
		const form = page.locator('[data-add-fixtures]');
		const mode = await form
			.getByLabel('Type · mode')
			.locator('option', { hasText: 'HSIC 8-bit (4)' })
			.first()
			.textContent();
		await form.getByLabel('Type · mode').selectOption({ label: mode! });
		await form.getByLabel('How many').fill('3');
		await form.getByLabel('First number').fill('601');
		await form.getByLabel('Start address').fill('1.505');
		// said before anything is sent: 505…512 holds two 4-slot footprints (ANSI E1.11: 512 slots)
		expect(await form.locator('[data-fit]').textContent()).toBe(
			'Only 2 of 3 fixtures of 4 slots each fit from 505 in a 512-slot universe; start at 501 or lower, or add 2.'
		);
		await screenshot(page, 'bulk-add-fit');
		await form.getByRole('button', { name: 'Add', exact: true }).click();
		expect(await form.getByRole('alert').textContent()).toContain('Only 2 of 3');

		await form.getByLabel('How many').fill('30');
		await form.getByLabel('Start address').fill('');
		await form.getByLabel('Label pattern').fill('DECK {n}');
		expect(await form.locator('[data-label-example]').textContent()).toBe('Labels: DECK 601 … DECK 630');
		await form.getByRole('button', { name: 'Add', exact: true }).click();
		await page.locator('[data-notice]', { hasText: 'Added 30 fixture(s), numbers 601–630.' }).waitFor();
		await page.getByRole('search').getByLabel('Search').fill('deck 6');
		await expect.poll(() => shown(page)).toBe(30);
		expect(await page.locator('[data-row="601"] [data-col="label"]').textContent()).toBe('DECK 601');
		expect(await page.locator('[data-row="601"] [data-col="control"]').textContent()).toContain('manual');
		// the grid draws a window of rows: narrow the search to see the last one
		await page.getByRole('search').getByLabel('Search').fill('deck 630');
		await expect.poll(() => rowNumbers(page)).toEqual([630]);
	});

	it('renumbers, relabels, sets state and feed, and duplicates, keeping the selection', async () => {
		const page = await newPage(stage.browser, 1440, 900);
		await openPatch(page);
		await page.getByRole('search').getByLabel('Search').fill('deck 6');
		await expect.poll(() => shown(page)).toBe(30);
		for (const n of [601, 602, 603]) await page.getByLabel(`Select fixture ${n}`).check();
		const count = page.locator('[data-selected-count]');
		expect(await count.textContent()).toBe('3 selected');

		await page.getByRole('button', { name: 'Renumber…' }).click();
		let dialog = page.getByRole('dialog');
		await dialog.getByLabel('From number').fill('701');
		expect(await dialog.textContent()).toContain('601 → 701 … 603 → 703');
		await dialog.getByRole('button', { name: 'Apply' }).click();
		await page.locator('[data-notice]', { hasText: 'Renumbered 3 fixture(s).' }).waitFor();
		expect(await count.textContent()).toBe('3 selected');

		await page.getByRole('button', { name: 'Relabel…' }).click();
		dialog = page.getByRole('dialog');
		await dialog.getByLabel('Label pattern').fill('BOW {i:02}');
		await dialog.getByRole('button', { name: 'Apply' }).click();
		await page.locator('[data-notice]', { hasText: 'Relabelled 3' }).waitFor();
		await page.getByRole('search').getByLabel('Search').fill('bow 0');
		await expect.poll(() => rowNumbers(page)).toEqual([701, 702, 703]);
		expect(await page.locator('[data-row="702"] [data-col="label"]').textContent()).toBe('BOW 02');
		expect(await count.textContent()).toBe('3 selected');

		await page.getByRole('button', { name: 'Set fields…' }).click();
		dialog = page.getByRole('dialog');
		await dialog.getByLabel('On-set state').selectOption('hung');
		await dialog.getByLabel('Power feed').selectOption({ label: 'Battery: Deck 4-cell Li-ion 98 Wh' });
		expect(await dialog.getByRole('note').textContent()).toContain('lithium packs');
		await screenshot(page, 'bulk-set-fields');
		await dialog.getByRole('button', { name: 'Apply' }).click();
		await page.locator('[data-notice]', { hasText: 'Set fields on 3' }).waitFor();
		await page.locator('[data-row="703"] [data-state="hung"]').waitFor();
		const packs = stage.server
			.db()
			.select({ packTypeId: fixtures.packTypeId })
			.from(fixtures)
			.where(and(eq(fixtures.projectId, pid), inArray(fixtures.number, [701, 702, 703])))
			.all()
			.map((r) => r.packTypeId);
		expect(packs).toHaveLength(3);
		expect(new Set(packs).size).toBe(1);
		expect(packs[0]).not.toBeNull();

		await page.getByRole('button', { name: 'Duplicate…' }).click();
		dialog = page.getByRole('dialog');
		await dialog.getByLabel('First number of the copies').fill('801');
		await dialog.getByRole('button', { name: 'Apply' }).click();
		await page.locator('[data-notice]', { hasText: 'Duplicated 3 fixture(s) as 801–803, unpatched.' }).waitFor();
		await expect.poll(() => rowNumbers(page)).toEqual([701, 702, 703, 801, 802, 803]);
		expect(await count.textContent()).toBe('3 selected');
		await screenshot(page, 'bulk-after');
	});

	it('rows with a conflict sit exactly where the others do, and nothing is cut from Type · mode', async () => {
		const page = await newPage(stage.browser, 1440, 900);
		await openPatch(page);
		await page.getByRole('search').getByLabel('Search').fill('stern');
		// the demo overlaps STERN SPARE (136) with STERN 4 (132) at 3.23–24
		await page.locator('[data-row="136"]').waitFor();
		const lefts = (n: number) =>
			page
				.locator(`[data-row="${n}"] [data-col]`)
				.evaluateAll((cells) => cells.map((c) => Math.round(c.getBoundingClientRect().left)));
		expect(await lefts(136)).toEqual(await lefts(131));
		// and under their headings (the heading row has smaller type: tracks must not depend on it)
		const heads = await page
			.locator('[data-head]')
			.evaluateAll((cells) => cells.map((c) => Math.round(c.getBoundingClientRect().left)));
		expect(heads).toEqual(await lefts(131));
		const cut = await page
			.locator('[data-col="typeMode"] span')
			.evaluateAll((spans) => spans.filter((s) => s.scrollWidth > s.parentElement!.clientWidth).length);
		expect(cut).toBe(0);
	});

	for (const theme of ['light', 'dark', 'dim']) {
		it(`${theme} theme: the selection toolbar and a bulk dialog (screenshot)`, async () => {
			const page = await newPage(stage.browser, 1440, 900);
			await openPatch(page, theme);
			await page.getByLabel('Select fixture 101').check();
			await page.getByLabel('Select fixture 102').check();
			await page.getByRole('toolbar', { name: 'Selected fixtures' }).waitFor();
			await screenshot(page, `bulk-toolbar-${theme}`);
			await page.getByRole('button', { name: 'Relabel…' }).click();
			await page.getByRole('dialog').getByLabel('Label pattern').fill('WHEEL {n:03}');
			await screenshot(page, `bulk-relabel-${theme}`);
			expect(await page.getByRole('dialog').textContent()).toContain('Labels: WHEEL 101 … WHEEL 102');
		});
	}
});

describe('bulk tools on a phone', () => {
	it('a programmer selects two cards and sets their state; the toolbar fits the screen', async () => {
		const page = await newPage(stage.browser, 390, 844, true);
		await openPatch(page, 'dim');
		await page.getByLabel('Select fixture 104').check();
		await page.getByLabel('Select fixture 105').check();
		const bar = page.getByRole('toolbar', { name: 'Selected fixtures' });
		const box = await bar.boundingBox();
		expect(box!.x + box!.width).toBeLessThanOrEqual(390);
		// one row over the cards: less than two of its own buttons high (it wrapped into five rows)
		const auto = await bar.getByRole('button', { name: 'Auto-address…' }).boundingBox();
		expect(box!.height).toBeLessThan(2 * auto!.height);
		await screenshot(page, 'bulk-phone-toolbar');
		// the rest is behind More, reached by keyboard: Enter opens it on its first tool, Esc closes it back
		const more = bar.getByRole('button', { name: 'More' });
		expect(await bar.getByRole('button', { name: 'Set fields…' }).isVisible()).toBe(false);
		await more.focus();
		await page.keyboard.press('Enter');
		expect(await more.getAttribute('aria-expanded')).toBe('true');
		await expect.poll(() => page.evaluate(() => document.activeElement?.textContent?.trim())).toBe('Move to universe…');
		await screenshot(page, 'bulk-phone-more');
		await page.keyboard.press('Escape');
		expect(await more.getAttribute('aria-expanded')).toBe('false');
		expect(await more.evaluate((el) => el === document.activeElement)).toBe(true);
		expect(await bar.getByRole('button', { name: 'Set fields…' }).isVisible()).toBe(false);
		await more.click();
		await bar.getByRole('button', { name: 'Set fields…' }).click();
		const dialog = page.getByRole('dialog');
		await dialog.getByLabel('On-set state').selectOption('fault');
		await screenshot(page, 'bulk-phone-set');
		await dialog.getByRole('button', { name: 'Apply' }).click();
		await page.locator('[data-notice]', { hasText: 'Set fields on 2' }).waitFor();
		await page.locator('[data-row="105"] [data-state="fault"]').waitFor();
		expect(await page.locator('[data-selected-count]').textContent()).toBe('2 selected');
	});
});

describe('the radio page follows others’ changes', () => {
	it('a relabel elsewhere shows on the channel grid without a reload', async () => {
		const page = await newPage(stage.browser, 1440, 900);
		await signIn(page, stage.server.url, 'programmer@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/radio`);
		const channel1 = page.locator('[data-channel="1"]').first();
		expect(await channel1.textContent()).toContain('TENDER BOW');
		await page.evaluate(() => ((window as unknown as { stayed: boolean }).stayed = true));

		const other = await stage.server.signIn('owner@demo.test');
		const list = (await (await other.get(`/api/projects/${pid}/fixtures`)).json()) as {
			fixtures: { id: number; label: string; version: number }[];
		};
		const bow = list.fixtures.find((f) => f.label === 'TENDER BOW')!;
		const res = await other.patch(`/api/projects/${pid}/fixtures/${bow.id}`, {
			label: 'TENDER BOW (LIVE)',
			version: bow.version
		});
		expect(res.status).toBe(200);
		await page.locator('[data-channel="1"]', { hasText: 'TENDER BOW (LIVE)' }).first().waitFor({ timeout: 5000 });
		expect(await page.evaluate(() => (window as unknown as { stayed?: boolean }).stayed)).toBe(true);
	});
});
