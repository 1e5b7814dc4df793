import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoProjectId } from '../helpers/revisions';
import { gdtfZip, TWO_BREAK_XML, VALUES_XML } from '../helpers/gdtf';
import { channels, makeFixture, makeType, makeUniverse } from '../helpers/patch-factories';
import { hydrated } from './helpers';
import { demoStage, screenshot, signInPage } from './launch';

// A mode over two DMX breaks (DIN SPEC 15800 DMX mode): the GDTF preview names each break's
// footprint, and the fixture page gives the programmer a start address per break.

const stage = demoStage();
const DESK = { width: 1440, height: 900 };
const PHONE = { width: 390, height: 844 };

async function themed(page: Page, theme: 'light' | 'dark') {
	await page.context().addCookies([{ name: 'pw-theme', value: theme, url: stage.server.url }]);
}

describe('DMX breaks in the browser', () => {
	it('the GDTF preview shows each break; the fixture page saves a start address per break with plain-word problems', async () => {
		const pid = demoProjectId(stage.server.db());
		const desk = await stage.browser.page(DESK);
		await signInPage(desk, stage.server.url, 'programmer@demo.test');
		await desk.goto(`${stage.server.url}/projects/${pid}/import`);
		const gdtf = desk.getByTestId('import-panel').nth(1);
		await gdtf.locator('input[type=file]').setInputFiles({
			name: 'twin.gdtf',
			mimeType: 'application/octet-stream',
			buffer: Buffer.from(gdtfZip(TWO_BREAK_XML))
		});
		await expect.poll(() => gdtf.getByTestId('import-summary').textContent()).toContain('Twin Feed');
		await screenshot(desk, 'breaks-gdtf-preview-desk');
		expect(await gdtf.getByRole('row', { name: /Split/ }).textContent()).toMatch(/6 \+ 4/);
		await gdtf.getByRole('button', { name: 'Apply' }).click();
		await expect.poll(() => gdtf.getByRole('status').textContent()).toContain('Imported.');

		// a fixture of the two-break mode, break 2 not yet addressed
		const programmer = await stage.server.signIn('programmer@demo.test');
		const base = `/api/projects/${pid}`;
		const patch = (await (await programmer.get(`${base}/patch`)).json()) as {
			universes: { id: number; number: number }[];
			types: { id: number; model: string; modes: { id: number }[] }[];
		};
		const type = patch.types.find((t) => t.model === 'Twin Feed')!;
		const [u1, u2] = patch.universes;
		const made = await programmer.post(`${base}/fixtures`, {
			number: 990,
			label: 'SPLIT TEST',
			typeId: type.id,
			modeId: type.modes[0].id,
			control: { kind: 'dmx', universeId: u1.id, address: 501 }
		});
		expect(made.status).toBe(201);

		await desk.goto(`${stage.server.url}/projects/${pid}/fixtures/990`);
		const editor = desk.getByTestId('break-addresses');
		await editor.waitFor();
		const row2 = editor.locator('[data-break="2"]');
		await row2.getByLabel('Universe').selectOption(String(u2.id));
		await row2.getByLabel('Start address').fill('510');
		await desk.getByRole('button', { name: 'Save addresses' }).click();
		await expect
			.poll(() => row2.getByRole('alert').textContent())
			.toBe('Break 2 needs 4 slots; from 510 it would run to slot 513, past 512. Start at 509 or lower.');
		await screenshot(desk, 'breaks-fixture-problem-desk');
		await row2.getByLabel('Start address').fill('101');
		await desk.getByRole('button', { name: 'Save addresses' }).click();
		await expect.poll(() => desk.getByText('Addresses saved.').count()).toBe(1);
		await expect.poll(() => desk.locator('[data-break-address="2"]').textContent()).toContain(`${u2.number}.101`);
		await screenshot(desk, 'breaks-fixture-desk-light');
		await desk.close();

		for (const [name, viewport, theme] of [
			['desk-dark', DESK, 'dark'],
			['phone-light', PHONE, 'light'],
			['phone-dark', PHONE, 'dark']
		] as const) {
			const page = await stage.browser.page(viewport, { mobile: viewport === PHONE });
			await themed(page, theme);
			await signInPage(page, stage.server.url, 'programmer@demo.test');
			await page.goto(`${stage.server.url}/projects/${pid}/fixtures/990`);
			await page.getByTestId('break-addresses').waitFor();
			expect(await page.locator('[data-break-address="2"]').textContent()).toContain(`${u2.number}.101`);
			await screenshot(page, `breaks-fixture-${name}`);
			await page.close();
		}
		// the electrician reads both addresses and gets no editor
		const phone = await stage.browser.page(PHONE, { mobile: true });
		await signInPage(phone, stage.server.url, 'electrician@demo.test');
		await phone.goto(`${stage.server.url}/projects/${pid}/fixtures/990`);
		expect(await phone.locator('[data-break-address="2"]').textContent()).toContain(`${u2.number}.101`);
		expect(await phone.getByTestId('break-addresses').count()).toBe(0);
		await screenshot(phone, 'breaks-fixture-electrician-phone');
		await phone.close();
	});

	it("a CTC channel running 10000 → 2000 K over DMX 0–199 reads so on the types and fixture pages, with the look's DMX value", async () => {
		const pid = demoProjectId(stage.server.db());
		const programmer = await stage.server.signIn('programmer@demo.test');
		const base = `/api/projects/${pid}`;
		const form = new FormData();
		form.set('file', new Blob([new Uint8Array(gdtfZip(VALUES_XML))]), 'values.gdtf');
		form.set('apply', 'true');
		const imported = await programmer.fetch(`${base}/import`, { method: 'POST', body: form });
		expect(imported.status).toBe(201);
		const type = ((await imported.json()) as { type: { id: number; modes: { id: number; name: string }[] } }).type;
		const universes = ((await (await programmer.get(`${base}/universes`)).json()) as { universes: { id: number }[] })
			.universes;
		const made = await programmer.post(`${base}/fixtures`, {
			number: 991,
			label: 'WARM KEY',
			typeId: type.id,
			modeId: type.modes.find((m) => m.name === 'Mirror')!.id,
			look: { cct: 6000 },
			control: { kind: 'dmx', universeId: universes[0].id, address: 480 }
		});
		expect(made.status).toBe(201);
		const page = await stage.browser.page(DESK);
		await signInPage(page, stage.server.url, 'programmer@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/fixtures/991`);
		const cct = page.getByRole('row', { name: /cct/ });
		// DIN SPEC 15800 channel function: PhysicalFrom at DMXFrom 0, PhysicalTo at 199; 6000 K is halfway → 100
		await expect.poll(() => cct.textContent()).toContain('10000 → 2000 K at DMX 0–199');
		expect(await cct.textContent()).toContain('planned 6000 K = DMX 100');
		await screenshot(page, 'breaks-ctc-fixture-desk');
		await page.goto(`${stage.server.url}/projects/${pid}/types`);
		const article = page.locator('article', { hasText: 'Value Lamp' });
		await article.locator('summary', { hasText: 'Mirror' }).click();
		expect(await article.getByRole('row', { name: /cct/ }).textContent()).toContain('10000 → 2000 K at DMX 0–199');
		await page.goto(`${stage.server.url}/projects/${pid}/types`);
		const twin = page.locator('article', { hasText: 'Twin Feed' });
		await twin.locator('summary', { hasText: 'Split' }).click();
		expect(await twin.locator('summary', { hasText: 'Split' }).textContent()).toContain('6 + 4 slots (breaks 1 and 2)');
		await twin.scrollIntoViewIfNeeded();
		await screenshot(page, 'breaks-types-desk');
		await page.close();
	});

	it('auto-address asks where each further break goes, follow on or a universe, and shows where each went', async () => {
		const db = stage.server.db();
		const pid = demoProjectId(db);
		const [u1, u2] = [makeUniverse(db, pid, 40), makeUniverse(db, pid, 41)];
		// 6 slots on break 1, 4 on break 2
		const { type, modeIds } = makeType(
			db,
			pid,
			{ Split: [...channels(6), ...channels(4).map((c) => ({ ...c, parameter: `b2-${c.parameter}`, dmxBreak: 2 }))] },
			'Split Batten'
		);
		for (const number of [980, 981])
			makeFixture(db, { projectId: pid, number, label: `SPLIT ${number}`, typeId: type.id, modeId: modeIds.Split });

		const page = await stage.browser.page(DESK);
		await signInPage(page, stage.server.url, 'programmer@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/patch`);
		await hydrated(page);
		await page.getByLabel('Search').fill('SPLIT');
		for (const n of [980, 981]) await page.getByLabel(`Select fixture ${n}`).check();
		await page
			.getByRole('toolbar', { name: 'Selected fixtures' })
			.getByRole('button', { name: 'Auto-address…' })
			.click();
		const dialog = page.getByRole('dialog');
		await dialog.getByRole('combobox').first().selectOption(String(u1.id));
		const break2 = dialog.getByLabel('Break 2');
		// follows on by default: break 2 right after break 1, in break 1's universe
		expect(await break2.inputValue()).toBe('');
		await dialog.getByRole('button', { name: 'Preview' }).click();
		const preview = dialog.locator('[data-preview]');
		await expect.poll(() => preview.textContent()).toContain('40.1');
		expect(await preview.locator('li').first().textContent()).toMatch(/40\.1.*break 2.*40\.7/s);

		await break2.selectOption(String(u2.id));
		await dialog.getByRole('button', { name: 'Preview' }).click();
		await expect.poll(() => preview.locator('li').first().textContent()).toMatch(/40\.1.*break 2.*41\.1/s);
		expect(await preview.locator('li').nth(1).textContent()).toMatch(/40\.7.*break 2.*41\.5/s);
		await screenshot(page, 'breaks-autoaddress-desk');
		await dialog.getByRole('button', { name: 'Apply' }).click();
		await page.locator('[data-notice]', { hasText: 'Placed 2 fixture(s) (break 2 in universe 41).' }).waitFor();

		const programmer = await stage.server.signIn('programmer@demo.test');
		const { fixtures } = (await (await programmer.get(`/api/projects/${pid}/fixtures`)).json()) as {
			fixtures: { number: number; control: unknown }[];
		};
		expect(fixtures.filter((f) => f.number >= 980 && f.number <= 981).map((f) => f.control)).toEqual([
			{ kind: 'dmx', universeId: u1.id, address: 1, breaks: [{ dmxBreak: 2, universeId: u2.id, address: 1 }] },
			{ kind: 'dmx', universeId: u1.id, address: 7, breaks: [{ dmxBreak: 2, universeId: u2.id, address: 5 }] }
		]);
		await page.close();
	});
});
