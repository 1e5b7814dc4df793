import { describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { demoStage, screenshot, signInPage } from './launch';

// The sign-off story from DESIGN.md "The job": the producer approves by opening a link on a phone.

const stage = demoStage();

describe('revision, review link and sign-off in the browser', () => {
	it('a programmer makes a revision and a link, the producer approves on a phone without an account, the programmer sees it', async () => {
		const pid = demoProjectId(stage.server.db());
		const page = await stage.browser.page();
		await signInPage(page, stage.server.url, 'programmer@demo.test');
		await page.goto(`${stage.server.url}/projects/${pid}/revisions`);
		await page.fill('#note', 'For the producer');
		await page.click('button:has-text("Make revision")');
		await page.locator('[data-testid="revision-1"]').waitFor();
		expect(await page.locator('[data-testid="revision-1"]').textContent()).toContain('For the producer');

		await page.selectOption('#link-revision', '1');
		await page.click('button:has-text("Make link")');
		const urlBox = page.locator('[data-testid="review-url"]');
		await urlBox.waitFor();
		const reviewUrl = await urlBox.inputValue();
		expect(reviewUrl).toMatch(new RegExp(`^${stage.server.url}/review/[A-Za-z0-9_-]{43}$`));
		await screenshot(page, 'review-link-made');

		// a context of its own: the producer has no session
		const mobile = await stage.browser.page({ width: 390, height: 844 }, { mobile: true });
		await mobile.goto(reviewUrl);
		expect(await mobile.locator('h1').textContent()).toBe('The Lantern Ferry — river unit');
		expect(await mobile.locator('[data-testid="review-revision"] h2').textContent()).toBe('Revision 1');
		// the demo carries a deliberate overlap, so the summary names at least one error
		expect(await mobile.locator('[data-testid="conflict-summary"]').textContent()).toMatch(/[1-9]\d* errors?/);
		// phone: fixtures as cards, the table hidden
		expect(await mobile.locator('[data-testid="review-fixture"]').first().isVisible()).toBe(true);
		expect(await mobile.locator('table').first().isVisible()).toBe(false);
		const width = await mobile.evaluate(() => document.documentElement.scrollWidth);
		expect(width).toBeLessThanOrEqual(390);
		// no session on the phone
		expect(await mobile.locator('a:has-text("Sign in")').count()).toBe(1);

		// empty name: the form refuses and keeps the comment (no decision is preselected, so choose one)
		await mobile.check('input[value="approved"]');
		await mobile.fill('#comment', 'Looks right for night one');
		await mobile.locator('#name').evaluate((el) => el.removeAttribute('required'));
		await mobile.click('button:has-text("Send sign-off")');
		await mobile.locator('.field-error').waitFor();
		expect(await mobile.inputValue('#comment')).toBe('Looks right for night one');

		await mobile.fill('#name', 'Pat Producer');
		await mobile.check('input[value="approved"]');
		await mobile.click('button:has-text("Send sign-off")');
		await mobile.locator('[data-testid="signed"]').waitFor();
		expect(await mobile.locator('[data-testid="review-revision"]').textContent()).toContain('by Pat Producer');
		// the link has decided on revision 1: the page shows that decision, and no second form, also after a reload
		const decision = mobile.getByTestId('link-decision');
		expect(await decision.textContent()).toMatch(/revision 1.*Approved.*by Pat Producer/s);
		expect(await mobile.locator('form[action="?/signoff"]').count()).toBe(0);
		await screenshot(mobile, 'review-approved-phone');
		await mobile.reload();
		await decision.waitFor();
		expect(await mobile.locator('form[action="?/signoff"]').count()).toBe(0);

		await page.goto(`${stage.server.url}/projects/${pid}/revisions`);
		const signoffs = await page.locator('[data-testid="revision-1"] [data-testid="signoffs"]').textContent();
		expect(signoffs).toContain('Approved');
		expect(signoffs).toContain('Pat Producer');
		expect(signoffs).toContain('Looks right for night one');
		await screenshot(page, 'revisions-approved');

		await page.goto(`${stage.server.url}/projects/${pid}`);
		const badge = page.locator('[data-testid="signoff-badge"]');
		await badge.locator('text=Pat Producer').waitFor();
		expect(await badge.textContent()).toContain('Approved');
	});
});
