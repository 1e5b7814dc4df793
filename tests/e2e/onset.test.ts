import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoProjectId } from '../helpers/revisions';
import { demoStage, screenshot, signInPage } from './launch';

// Issue 19: the producer's review and the electrician's fixture page, on a 390 × 844 phone.

const stage = demoStage();
const PHONE = { width: 390, height: 844 };

interface PatchBody {
	universes: { id: number; number: number }[];
	types: { id: number; modes: { id: number; name: string }[] }[];
	fixtures: { id: number; number: number; label: string; modeId: number; version: number; control: { kind: string } }[];
}

/** True when the element's box lies wholly inside the first screen, no scrolling. */
async function inFirstScreen(page: Page, selector: string): Promise<boolean> {
	const box = await page.locator(selector).first().boundingBox();
	return box !== null && box.y >= 0 && box.y + box.height <= PHONE.height;
}

describe('on set and on paper, on a phone', () => {
	it('the producer reads what changed in words — universes and modes, no field names or ids — and signs off', async () => {
		const pid = demoProjectId(stage.server.db());
		const programmer = await stage.server.signIn('programmer@demo.test');
		const base = `/api/projects/${pid}`;
		expect((await programmer.post(`${base}/revisions`, { note: 'Night one' })).status).toBe(201);
		const first = await programmer.post(`${base}/review-links`, { revision: 1 });
		const firstUrl = ((await first.json()) as { url: string }).url;
		const approve = await stage.server
			.anonymous()
			.post(`/api/review/${new URL(firstUrl).pathname.split('/').pop()}/signoff`, {
				name: 'Pat Producer',
				decision: 'approved',
				comment: ''
			});
		expect(approve.status).toBe(201);

		// the programmer moves one fixture to another universe and changes another's mode
		const patch = (await (await programmer.get(`${base}/patch`)).json()) as PatchBody;
		const dmx = patch.fixtures.filter((f) => f.control.kind === 'dmx');
		const moved = dmx[0];
		const target = patch.universes[patch.universes.length - 1];
		let res = await programmer.patch(`${base}/fixtures/${moved.id}`, {
			control: { kind: 'dmx', universeId: target.id, address: 161 },
			version: moved.version
		});
		expect(res.status).toBe(200);
		const remode = patch.fixtures.find(
			(f) =>
				f.id !== moved.id && (patch.types.find((t) => t.modes.some((m) => m.id === f.modeId))?.modes.length ?? 0) > 1
		)!;
		const modes = patch.types.find((t) => t.modes.some((m) => m.id === remode.modeId))!.modes;
		const from = modes.find((m) => m.id === remode.modeId)!;
		const to = modes.find((m) => m.id !== remode.modeId)!;
		res = await programmer.patch(`${base}/fixtures/${remode.id}`, { modeId: to.id, version: remode.version });
		expect(res.status).toBe(200);
		expect((await programmer.post(`${base}/revisions`, { note: 'Night two' })).status).toBe(201);
		const link = (await (await programmer.post(`${base}/review-links`, { revision: 'latest' })).json()) as {
			url: string;
		};

		const phone = await stage.browser.page(PHONE, { mobile: true });
		await phone.goto(link.url);
		const plan = phone.locator('[data-testid="diff-plan"]');
		await plan.waitFor();
		const text = (await plan.textContent()) ?? '';
		expect(text).toContain(`Fixture ${moved.number} ${moved.label} moved from`);
		expect(text).toContain(`to ${target.number}.161`);
		expect(text).toContain(`mode ${from.name} → ${to.name}`);
		// no field name, no database id anywhere the producer reads
		const page = (await phone.locator('main, body').first().innerText()).replace(/\s+/g, ' ');
		expect(page).not.toMatch(/control\.|universeId|modeId|typeId|receiverId/);
		expect(page).not.toContain(`→ ${to.id} `);
		// the changes come before the sign-off form
		const diffBox = await phone.locator('[data-testid="diff"]').boundingBox();
		const formBox = await phone.locator('form[action="?/signoff"]').boundingBox();
		expect(diffBox!.y).toBeLessThan(formBox!.y);
		// nothing is decided for the producer, and each choice is a thumb-sized target
		expect(await phone.locator('input[name="decision"]:checked').count()).toBe(0);
		for (const choice of await phone.locator('fieldset label').all())
			expect((await choice.boundingBox())!.height).toBeGreaterThanOrEqual(44);
		await screenshot(phone, 'onset-review-phone');

		await phone.fill('#name', 'Pat Producer');
		await phone.locator('label:has(input[value="approved"])').click();
		await phone.click('button:has-text("Send sign-off")');
		await phone.locator('[data-testid="signed"]').waitFor();
		// the name is kept on this phone for the next review (a new link: this one has decided on revision 2)
		const next = (await (await programmer.post(`${base}/review-links`, { revision: 1 })).json()) as { url: string };
		await phone.goto(next.url);
		await phone.locator('#name').waitFor();
		await expect.poll(() => phone.inputValue('#name')).toBe('Pat Producer');
	});

	it('the electrician marks a state without scrolling, walks to the next fixture and finds the change in its history', async () => {
		const pid = demoProjectId(stage.server.db());
		const phone = await stage.browser.page(PHONE, { mobile: true });
		await signInPage(phone, stage.server.url, 'electrician@demo.test');
		await phone.goto(`${stage.server.url}/projects/${pid}/fixtures/106`);
		const first = (await phone.locator('h1').textContent()) ?? '';
		const button = phone.getByRole('button', { name: 'checked' });
		expect(await inFirstScreen(phone, 'button[value="checked"]')).toBe(true);
		expect(await inFirstScreen(phone, '[data-address]')).toBe(true);
		expect((await button.boundingBox())!.height).toBeGreaterThanOrEqual(44);
		await screenshot(phone, 'onset-fixture-phone');
		// WHEEL 6 hangs on a mains circuit: its caution is titled once, in the summary that folds it
		const cautions = await phone.locator('section[aria-label="Cautions"]').innerText();
		expect(cautions.match(/Caution: mains power/g)?.length).toBe(1);
		await button.click();
		await phone.locator('[data-state="checked"]').waitFor();
		// the answer sits beside the buttons and says what happened
		expect(await phone.locator('form[action="?/state"] + p').textContent()).toContain('Marked checked');
		expect(await phone.locator('[data-testid="history"]').textContent()).toMatch(/marked checked \(was \w+\)/);

		await phone.locator('[data-testid="next-all"]').click();
		await phone.waitForURL(/\/fixtures\/(?!106$)\d+$/);
		expect(await phone.locator('h1').textContent()).not.toBe(first);
		await phone.locator('[data-testid="prev-all"]').click();
		await phone.waitForURL(/\/fixtures\/106$/);
		const history = (await phone.locator('[data-testid="history"]').textContent()) ?? '';
		expect(history).toContain('marked checked');
		expect(history).toMatch(/Eli|electrician/i);
	});
});
