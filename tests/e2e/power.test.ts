import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { newPage, screenshot, signIn } from './helpers';
import { demoStage } from './launch';

// The Power page in the browser (issue 15): a programmer sets feeds in bulk and sees the shortfall.

const stage = demoStage();

async function theme(page: Page, value: 'light' | 'dark' | 'dim') {
	await page.context().addCookies([{ name: 'pw-theme', value, url: stage.server.url }]);
}

describe('power page', () => {
	it('a programmer puts the four tender pucks on the block pack in one go and sees two go dark at the start', async () => {
		const pid = demoProjectId(stage.server.db());
		const page = await newPage(stage.browser, 1440, 900);
		await signIn(page, stage.server.url, 'programmer@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/power`);
		// the demo's own shortfall: two deck tubes run out in the second swap round (16:00–02:00 day)
		await page.getByText('Fixture 124 goes dark at 00:55 unless 2 more packs are charged.').waitFor();
		const feeds = page.locator('form[action="?/setFeed"]');
		for (const n of [142, 143, 144, 145]) await feeds.locator(`input[data-fixture="${n}"]`).check();
		await feeds
			.getByLabel('Set feed of the ticked fixtures to')
			.selectOption({ label: 'Battery · Block 8-cell Li-ion 10 Ah' });
		await feeds.getByRole('button', { name: 'Set feed (4)' }).click();
		await page.getByRole('status').filter({ hasText: 'Feed set on 4 fixtures.' }).waitFor();
		// three packs on hand: WHEEL BALL A (113) and the first two pucks take them, 144 and 145 wait;
		// nobody swaps before 00:52, so no flat is on charge when 113 needs its second pack: 3 more
		const shortfalls = page.getByRole('list', { name: 'Shortfalls' });
		await shortfalls.getByText('Fixture 144 goes dark at 16:00 unless 3 more packs are charged.').waitFor();
		expect((await shortfalls.locator('li').allTextContents()).map((t) => t.replace(/\s+/g, ' ').trim())).toEqual([
			'Fixture 144 goes dark at 16:00 unless 3 more packs are charged.',
			'Fixture 145 goes dark at 16:00 unless 3 more packs are charged.',
			'Fixture 113 goes dark at 00:52 unless 3 more packs are charged.',
			'Fixture 124 goes dark at 00:55 unless 2 more packs are charged.',
			'Fixture 125 goes dark at 00:55 unless 2 more packs are charged.'
		]);
		const block = page.locator('article', { has: page.getByRole('heading', { name: 'Block 8-cell Li-ion 10 Ah' }) });
		expect(await block.locator('tbody tr').count()).toBe(5);
		await screenshot(page, 'power-desk-light');
		await theme(page, 'dark');
		await page.reload();
		await screenshot(page, 'power-desk-dark');

		// the viewer reads the same page on a phone, no edit controls
		const phone = await newPage(stage.browser, 390, 844, true);
		await signIn(phone, stage.server.url, 'viewer@demo.test');
		await phone.goto(`${stage.server.url}/projects/${pid}/power`);
		await phone.getByText('Fixture 144 goes dark at 16:00').waitFor();
		expect(await phone.locator('form[action="?/setFeed"]').count()).toBe(0);
		await screenshot(phone, 'power-phone-light');
		// one part at a time on a phone: the rotation first, the others a tap away
		const parts = phone.getByRole('navigation', { name: 'Parts of the power plan' });
		expect(await phone.locator('#packs').isVisible()).toBe(false);
		await parts.getByRole('button', { name: /^Packs/ }).click();
		expect(await phone.locator('#packs').isVisible()).toBe(true);
		expect(await phone.locator('#rotation').isVisible()).toBe(false);
		await screenshot(phone, 'power-phone-packs-light');
		await theme(phone, 'dark');
		await phone.reload();
		await screenshot(phone, 'power-phone-dark');
		// the night theme on set, circuits open
		await theme(phone, 'dim');
		await phone.reload();
		await parts.getByRole('button', { name: /^Circuits/ }).click();
		await phone.locator('#circuits').waitFor();
		await screenshot(phone, 'power-phone-circuits-night');
		// on the desk every part shows and the switcher is hidden
		expect(await page.locator('#packs').isVisible()).toBe(true);
		expect(await page.getByRole('navigation', { name: 'Parts of the power plan' }).isVisible()).toBe(false);
	});
});
