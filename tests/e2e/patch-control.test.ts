import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { demoProjectId } from '../helpers/revisions';
import { newPage, patchRows, screenshot, signIn } from './helpers';
import { demoStage } from './launch';

// The control drawer, link groups and quick fixes, as a programmer at a desk (1440×900) and on a
// phone (390×844). Demo data (src/lib/server/demo.ts, invented): 101 leads 115; 133–135 are link
// group BANK-CHAIN at 3.41; 136 (8-bit panel, 4 slots) starts at 3.23 over 132's 3.21–24; 141 has a
// per-parameter map on universe 4; 142–145 are on the radio receiver, channels 1–9; 146 is manual.

const stage = demoStage();
const AXE = readFileSync('node_modules/axe-core/axe.min.js', 'utf8');
let pid: number;
beforeAll(() => {
	pid = demoProjectId(stage.server.db());
});

async function desk(): Promise<Page> {
	const page = await newPage(stage.browser, 1440, 900);
	await signIn(page, stage.server.url, 'programmer@demo.test');
	await page.goto(`${stage.server.url}/projects/${pid}/patch`);
	await patchRows(page);
	return page;
}

/** Narrows the table to one fixture by its label, so its row is drawn whatever the window. */
async function show(page: Page, label: string) {
	await page.getByLabel('Search').fill(label);
	await page.locator('[data-row]', { hasText: label }).first().waitFor();
}

async function openDrawer(page: Page, n: number) {
	await page.getByRole('button', { name: `Edit control of fixture ${n}` }).click();
	const d = page.locator('[data-control-drawer]');
	await d.waitFor();
	return d;
}

/** Saves the drawer and waits until it has closed and the table says so. */
async function save(page: Page, n: number) {
	const d = page.locator('[data-control-drawer]');
	await d.getByRole('button', { name: 'Save control' }).click();
	await d.waitFor({ state: 'detached' });
	await page.locator('[data-notice]', { hasText: `Fixture ${n}: control saved.` }).waitFor();
}

const controlText = (page: Page, n: number) => page.locator(`[data-row="${n}"] [data-col="control"]`).textContent();

async function axeViolations(page: Page, selector: string): Promise<string[]> {
	await page.evaluate(AXE);
	return page.evaluate(async (sel) => {
		const axe = (
			window as unknown as {
				axe: {
					run: (c: unknown, o: unknown) => Promise<{ violations: { id: string; nodes: { target: string[] }[] }[] }>;
				};
			}
		).axe;
		const r = await axe.run(sel, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } });
		return r.violations.map((v) => `${v.id} ×${v.nodes.length} e.g. ${v.nodes[0]?.target.join(' ')}`);
	}, selector);
}

describe('the control drawer', () => {
	it('sets one fixture to each of the five control kinds from the table', async () => {
		const page = await desk();
		await show(page, 'HAND LANTERN');
		expect(await controlText(page, 146)).toContain('manual');

		// DMX, typed as universe.address
		let d = await openDrawer(page, 146);
		await d.getByLabel('DMX', { exact: true }).check();
		await d.getByLabel('Address', { exact: true }).fill('4.100');
		await screenshot(page, 'control-drawer-dmx');
		await save(page, 146);
		await expect.poll(() => controlText(page, 146)).toContain('4.100');

		// an address past 512 for the footprint is refused beside the field, nothing sent
		d = await openDrawer(page, 146);
		await d.getByLabel('Address', { exact: true }).fill('512');
		await d.getByRole('button', { name: 'Save control' }).click();
		expect(await d.locator('#err-address').textContent()).toMatch(/past 512\. The last start that fits is \d+/);
		expect(await d.getByLabel('Address', { exact: true }).getAttribute('aria-invalid')).toBe('true');

		// a per-parameter map on universe 4, filled with the free slots it suggests
		await d.getByLabel('Address per parameter').check();
		await d.getByLabel('Universe').selectOption('4');
		await d.getByRole('button', { name: 'Fill the empty ones with free slots' }).click();
		const cct = await d.locator('[data-map] input').first().inputValue();
		// universe 4 holds 137–140 at 1–8 and 141's 20, 30, 31: the first free slot is 9 (common practice: first fit)
		expect(cct).toBe('9');
		await screenshot(page, 'control-drawer-map');
		await save(page, 146);
		await expect.poll(() => controlText(page, 146)).toMatch(/4: 9, 10 \(per parameter\)/);

		// RC: a channel another fixture drives is shown as a collision as it is picked
		d = await openDrawer(page, 146);
		await d.getByLabel('RC radio').check();
		const first = d.locator('[data-rc] select').first();
		await first.selectOption('1');
		expect(await d.locator('[data-clash]').first().textContent()).toMatch(
			/Channel 1 already drives intensity of fixture 142/
		);
		await first.selectOption('');
		await d.getByRole('button', { name: 'Give the empty ones free channels' }).click();
		// 142–145 use 1–9, so the first free channel is 10
		expect(await first.inputValue()).toBe('10');
		expect(await d.locator('[data-clash]').count()).toBe(0);
		await screenshot(page, 'control-drawer-rc');
		await save(page, 146);
		await expect.poll(() => controlText(page, 146)).toMatch(/ch 10, 11/);

		// follow: itself and a follower are refused with a sentence; a leader is taken
		d = await openDrawer(page, 146);
		await d.getByLabel('Follow a leader').check();
		await d.getByLabel('Leader (fixture number)').fill('146');
		await d.getByRole('button', { name: 'Save control' }).click();
		expect(await d.locator('#err-leader').textContent()).toContain('A fixture cannot follow itself.');
		await d.getByLabel('Leader (fixture number)').fill('115');
		await d.getByRole('button', { name: 'Save control' }).click();
		expect(await d.locator('#err-leader').textContent()).toContain(
			'Fixture 115 follows 101 itself; follow 101 instead.'
		);
		await d.getByLabel('Leader (fixture number)').fill('101');
		await save(page, 146);

		// followers are listed under their leader: 115 and now 146 right after 101
		await page.getByLabel('Search').fill('');
		await page.locator('[data-row="101"]').waitFor();
		const index = (n: number) => page.locator(`[data-row="${n}"]`).getAttribute('data-index');
		await expect.poll(async () => Number(await index(146))).toBe(Number(await index(101)) + 2);
		expect(Number(await index(115))).toBe(Number(await index(101)) + 1);
		expect(await controlText(page, 146)).toContain('follows 101');

		// and back to manual
		await show(page, 'HAND LANTERN');
		d = await openDrawer(page, 146);
		await d.getByLabel('Manual').check();
		await save(page, 146);
		await expect.poll(() => controlText(page, 146)).toContain('manual');
	});

	it('opens from the keyboard, keeps focus inside, closes on Escape and gives focus back; axe finds nothing', async () => {
		const page = await desk();
		await show(page, 'QUAY PUCK');
		await page.locator('[data-row="141"] [data-col="control"]').focus();
		await page.keyboard.press('Enter');
		const d = page.locator('[data-control-drawer]');
		await d.waitFor();
		// the per-parameter map the puck already has
		expect(await d.getByLabel('Address per parameter').isChecked()).toBe(true);
		expect(await d.getByLabel('intensity', { exact: true }).inputValue()).toBe('20');
		const inside = () => page.evaluate(() => !!document.activeElement?.closest('[data-control-drawer]'));
		expect(await inside()).toBe(true);
		for (let i = 0; i < 25; i++) {
			await page.keyboard.press('Tab');
			// a modal dialog makes the page behind it inert (HTML "modal dialogs"): focus never lands there
			expect(await page.evaluate(() => !!document.activeElement?.closest('[data-grid]'))).toBe(false);
		}
		expect(await axeViolations(page, '[data-control-drawer]')).toEqual([]);
		await page.keyboard.press('Escape');
		await d.waitFor({ state: 'detached' });
		expect(await page.evaluate(() => (document.activeElement as HTMLElement).dataset.col)).toBe('control');
	});

	it.each(['light', 'dark', 'dim'])('%s theme: the open drawer and the conflict fixes pass axe', async (theme) => {
		const page = await newPage(stage.browser, 1440, 900);
		await signIn(page, stage.server.url, 'programmer@demo.test');
		await page.context().addCookies([{ name: 'pw-theme', value: theme, url: stage.server.url }]);
		await page.goto(`${stage.server.url}/projects/${pid}/patch`);
		await patchRows(page);
		await page.locator('[data-quick-fix]').first().waitFor();
		expect(await axeViolations(page, '[data-conflict-list]')).toEqual([]);
		await show(page, 'QUAY PUCK');
		await openDrawer(page, 141);
		expect(await axeViolations(page, '[data-control-drawer]')).toEqual([]);
		await page.screenshot({ path: `test-results/screenshots/control-drawer-${theme}.png` });
	});

	it('shows a change by someone else while open, and refuses to save over it until asked', async () => {
		const page = await desk();
		await show(page, 'QUAY BALL 4');
		const d = await openDrawer(page, 140);
		await d.getByLabel('Address', { exact: true }).fill('4.200');
		// another programmer renames 140 through the API (its own context, its own session)
		const other = await newPage(stage.browser);
		await signIn(other, stage.server.url, 'programmer@demo.test');
		const status = await other.evaluate(async (pid) => {
			const list = await (await fetch(`/api/projects/${pid}/fixtures`)).json();
			const f = list.fixtures.find((x: { number: number }) => x.number === 140);
			const res = await fetch(`/api/projects/${pid}/fixtures/${f.id}`, {
				method: 'PATCH',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ label: 'QUAY BALL FOUR', version: f.version })
			});
			return res.status;
		}, pid);
		expect(status).toBe(200);
		await d.locator('[data-changed-elsewhere]').waitFor({ timeout: 5000 });
		// what was typed is kept
		expect(await d.getByLabel('Address', { exact: true }).inputValue()).toBe('4.200');
		await d.getByRole('button', { name: 'Save control' }).click();
		await d.getByText('Nothing was saved').waitFor();
		await d.getByRole('button', { name: 'Start again from theirs' }).last().click();
		expect(await d.getByLabel('Address', { exact: true }).inputValue()).toBe('7');
		await save(page, 140);
		await other.close();
	});

	it('on a phone the drawer is a full-width sheet', async () => {
		const page = await newPage(stage.browser, 390, 844, true);
		await signIn(page, stage.server.url, 'programmer@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/patch`);
		await patchRows(page);
		await show(page, 'TENDER BOW');
		const d = await openDrawer(page, 142);
		expect(await d.getByLabel('RC radio').isChecked()).toBe(true);
		const box = await d.boundingBox();
		expect(box?.width).toBe(390);
		await screenshot(page, 'control-drawer-phone');
		await d.getByRole('button', { name: 'Cancel' }).click();
		await d.waitFor({ state: 'detached' });
	});
});

describe('link groups and quick fixes', () => {
	it('refuses a link across addresses, links two units at one address, renames and unlinks the group', async () => {
		const page = await desk();
		await show(page, 'QUAY BALL');
		await page.getByLabel('Select fixture 137').check();
		await page.getByLabel('Select fixture 138').check();
		await page.getByRole('button', { name: 'Link…' }).click();
		expect(await page.locator('[data-link-refused]').textContent()).toBe(
			'Fixture 138 is at 4.3 and 137 at 4.1; linked units share one universe and address.'
		);

		// put 138 on 137's address: a shared-address warning, with "link them" one click away
		let d = await openDrawer(page, 138);
		await d.getByLabel('Address', { exact: true }).fill('4.1');
		await save(page, 138);
		const fix = page.locator('[data-quick-fix]', { hasText: 'Link 137, 138 as LINK-1' });
		await fix.waitFor();
		expect(await fix.textContent()).toContain('link group LINK-1');
		await screenshot(page, 'quick-fix-link');
		await fix.getByRole('button').click();
		await page.locator('[data-notice]', { hasText: 'Link 137, 138 as LINK-1: done.' }).waitFor();
		await expect.poll(() => page.locator('[data-row="138"] [data-col="conflicts"]').textContent()).toContain('linked');

		// rename from the drawer; the whole group follows
		d = await openDrawer(page, 137);
		await d.getByLabel('Group name').fill('QUAY PAIR');
		await d.getByRole('button', { name: 'Rename group' }).click();
		await page.locator('[data-notice]', { hasText: 'Link group renamed to QUAY PAIR.' }).waitFor();
		await d.getByRole('button', { name: 'Cancel' }).click();
		await page.getByLabel('Search').fill('QUAY PAIR');
		await expect.poll(() => page.locator('[data-row]').count()).toBe(2);

		// unlink from the selection bar
		await page.getByRole('button', { name: 'Unlink 2' }).click();
		await page.locator('[data-notice]', { hasText: 'Unlinked 137, 138.' }).waitFor();
		await expect.poll(() => page.locator('[data-row]').count()).toBe(0);
	});

	it('fixes an overlap with one click, after saying where the fixture goes', async () => {
		const page = await desk();
		const fix = page.locator('[data-quick-fix]', { hasText: 'Move 136 to next free address 3.' }).first();
		await fix.waitFor();
		const label = (await fix.getByRole('button').textContent())!;
		const target = /3\.(\d+)/.exec(label)![1];
		// 136 is an 8-bit panel (4 slots, demo data); from its own 23, first fit past 132 (21–24) is 25
		expect(target).toBe('25');
		expect(await fix.textContent()).toContain('moves from 3.23 to 3.25 (slots 25–28, free now)');
		await fix.getByRole('button').click();
		await page.locator('[data-notice]', { hasText: 'Move 136 to next free address 3.25: done.' }).waitFor();
		await show(page, 'STERN SPARE');
		await expect.poll(() => controlText(page, 136)).toContain('3.25');
		await expect.poll(() => page.locator('[data-row="136"] [data-col="conflicts"]').textContent()).toBe('');
	});
});
