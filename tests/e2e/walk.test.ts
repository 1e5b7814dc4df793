import { describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { gdtfZip, TWO_BREAK_XML } from '../helpers/gdtf';
import { demoStage, screenshot, signInPage } from './launch';

// "Done means a person can do it": what the people walking the pages read. Found by looking at
// screenshots of the demo: the fixture page showed power codes (`circuit-over-80`) and an Art-Net
// port-address for a wired-DMX universe, and its channel table ran "Bits" into "Address" on a phone.

const stage = demoStage();
const PHONE = { width: 390, height: 844 };
const CODES = /circuit-over-\d+|over-current|voltage-range|air-travel-|no-power-data/;

describe('walking the pages as the people who use them', () => {
	it('an electrician on a phone reads power warnings in words and only the addressing that applies to the universe', async () => {
		const pid = demoProjectId(stage.server.db());
		const phone = await stage.browser.page(PHONE, { mobile: true });
		await signInPage(phone, stage.server.url, 'electrician@demo.test');

		// 106 is on universe 1 (wired DMX) and the Wheelhouse ring, loaded above 80 % of its breaker (demo.ts)
		await phone.goto(`${stage.server.url}/projects/${pid}/fixtures/106`);
		const power = phone.locator('[data-fixture-power]');
		await power.getByText('On mains').waitFor();
		const main = (await phone.locator('main').textContent()) ?? '';
		expect(main).not.toMatch(CODES);
		expect(await power.textContent()).toContain('Circuit above 80 %');
		// an Art-Net port-address means nothing on a wired DMX line (Art-Net 4: it addresses Art-Net packets)
		expect(main).toContain('Wired DMX');
		expect(main).not.toContain('Art-Net port-address');

		// the channel table's columns keep apart on a 390 px screen
		const heads = phone.locator('thead th');
		const bits = (await heads.nth(1).boundingBox())!;
		const address = (await heads.nth(2).boundingBox())!;
		const bitsText = await heads.nth(1).evaluate((th) => {
			const r = document.createRange();
			r.selectNodeContents(th);
			return r.getBoundingClientRect().right;
		});
		expect(address.x - bitsText).toBeGreaterThanOrEqual(8);
		expect(bits.width).toBeGreaterThan(0);
		await screenshot(phone, 'walk-fixture-106-phone');

		// a conflict on the fixture page is named in words ('Overlap:'), not by its severity code ('error:')
		await phone.goto(`${stage.server.url}/projects/${pid}/fixtures/132`);
		expect(await phone.locator('main').textContent()).toContain('Overlap: Fixtures 132 and 136');

		// 137 is on universe 4, sent over Art-Net: there the port-address is what the node is set to
		await phone.goto(`${stage.server.url}/projects/${pid}/fixtures/137`);
		expect(await phone.locator('main').textContent()).toMatch(/Art-Net port-address \d+/);
	});

	it('the power page names each warning in words', async () => {
		const pid = demoProjectId(stage.server.db());
		const desk = await stage.browser.page({ width: 1440, height: 900 });
		await signInPage(desk, stage.server.url, 'programmer@demo.test');
		await desk.goto(`${stage.server.url}/projects/${pid}/power`);
		await desk.getByText('Saloon practicals (B10)').first().waitFor();
		const text = (await desk.locator('main').textContent()) ?? '';
		expect(text).not.toMatch(CODES);
		expect(text).toContain('Breaker will trip');
	});

	it('the universes page counts in words and offers each slot map as a button', async () => {
		const pid = demoProjectId(stage.server.db());
		const desk = await stage.browser.page({ width: 1440, height: 900 });
		await signInPage(desk, stage.server.url, 'programmer@demo.test');
		await desk.goto(`${stage.server.url}/projects/${pid}/universes`);
		const three = desk.locator('[data-universe="3"]');
		// universe 3 holds the demo's one overlap (fixtures 132 and 136)
		expect(await three.textContent()).toMatch(/10 fixtures · .*1 error\b/s);
		expect(await desk.locator('main').textContent()).not.toContain('(s)');
		await three.getByRole('link', { name: 'Slot map of universe 3' }).click();
		await desk.locator('[data-slot-map]').waitFor();
		expect(await desk.locator('[data-slot-counts]').textContent()).toMatch(/2 overlapping slots · \d+ linked slots?\./);
		// universe 3 goes over wireless DMX: no multicast group or port-address applies, and kinds read as words
		const map = (await desk.locator('main').textContent()) ?? '';
		expect(map).toContain('Wireless DMX');
		expect(map).not.toMatch(/dmx-wireless|sACN group|Art-Net port-address|overlap:|linked:/);
		expect(map).toContain('Overlap: Fixtures 132 and 136');
		// universe 2 goes over sACN: its multicast group is 239.255.0.2 (ANSI E1.31 §9.3.1: 239.255.hi.lo)
		await desk.goto(`${stage.server.url}/projects/${pid}/universes/2`);
		const facts = (await desk.locator('[data-universe-facts]').textContent()) ?? '';
		expect(facts).toContain('239.255.0.2');
		expect(facts).not.toContain('Art-Net');
	});

	it('a producer signs off by link on a phone and the page stays true after the approval', async () => {
		const pid = demoProjectId(stage.server.db());
		const programmer = await stage.server.signIn('programmer@demo.test');
		expect((await programmer.post(`/api/projects/${pid}/revisions`, { note: 'For the producer' })).status).toBe(201);
		const res = await programmer.post(`/api/projects/${pid}/review-links`, { revision: 'latest' });
		const { url } = (await res.json()) as { url: string };
		const phone = await stage.browser.page(PHONE, { mobile: true });
		await phone.goto(`${stage.server.url}${new URL(url).pathname}`);
		await phone.getByLabel('Your name').fill('Pat Producer');
		await phone.getByText('Approve this revision').click();
		await phone.getByRole('button', { name: 'Send sign-off' }).click();
		await phone.getByTestId('signed').waitFor();
		const text = (await phone.locator('main').textContent()) ?? '';
		expect(text).toContain('Approved');
		// it read "No revision of this project has been approved yet" right under the approval
		expect(text).not.toContain('approved yet');
		expect(text).toContain('No earlier revision of this project was approved');
	});

	it('editing a two-break type names the break of each offset', async () => {
		const pid = demoProjectId(stage.server.db());
		const programmer = await stage.server.signIn('programmer@demo.test');
		const form = new FormData();
		form.set('file', new Blob([Buffer.from(gdtfZip(TWO_BREAK_XML))]), 'twin.gdtf');
		form.set('apply', 'true');
		expect((await programmer.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: form })).status).toBe(201);
		const desk = await stage.browser.page({ width: 1440, height: 900 });
		await signInPage(desk, stage.server.url, 'programmer@demo.test');
		await desk.goto(`${stage.server.url}/projects/${pid}/types`);
		await desk.getByRole('button', { name: /Edit.*Twin Feed/ }).click();
		// Twin Feed's mode (tests/helpers/gdtf.ts): intensity 16-bit and red on break 1, green and blue on break 2;
		// channel 3 (green) at offset 1 read as if it sat on intensity's slot 1 (DIN SPEC 15800: each break counts from 1)
		await desk.getByLabel('Mode 1 channel 3 offset in DMX break 2').waitFor();
		expect(await desk.locator('[data-slot-count]').first().textContent()).toContain('6 slots in break 1');
		await screenshot(desk, 'walk-types-two-break-desk');
	});

	it('on a phone the current tab of the project is in view, not past the edge of the tab row', async () => {
		const pid = demoProjectId(stage.server.db());
		const phone = await stage.browser.page(PHONE, { mobile: true });
		await signInPage(phone, stage.server.url, 'electrician@demo.test');
		for (const part of ['power', 'revisions', 'members']) {
			await phone.goto(`${stage.server.url}/projects/${pid}/${part}`);
			const row = (await phone.getByRole('navigation', { name: 'Project sections' }).boundingBox())!;
			const tab = phone.getByRole('navigation', { name: 'Project sections' }).locator('[aria-current="page"]');
			await expect
				.poll(async () => (await tab.boundingBox())!.x + (await tab.boundingBox())!.width)
				.toBeLessThanOrEqual(row.x + row.width - 39);
			expect((await tab.boundingBox())!.x).toBeGreaterThanOrEqual(row.x);
		}
	});
});
