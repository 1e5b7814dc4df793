import { describe, expect, it } from 'vitest';
import { demoStage, mailedLink, screenshot, signInPage } from './launch';

const stage = demoStage();

// Issue 12 end to end in Chromium: a person signs up, proves the mailbox by the mailed link, is
// invited by the demo owner, accepts, and is a member; then the account and crew pages.

describe('sign-up → confirm → invited → member (Chromium)', () => {
	it('a new electrician joins the demo project by invitation', async () => {
		const base = stage.server.url;
		const email = 'cass.cable@crew.test';
		const newcomer = await stage.browser.page({ width: 390, height: 844 }, { mobile: true });
		await newcomer.goto(`${base}/signup`);
		await newcomer.getByLabel('Your name').fill('Cass Cable');
		await newcomer.getByLabel('E-mail').fill(email);
		await newcomer.getByLabel('Password').fill('spot lamps on the gantry');
		await newcomer.getByRole('button', { name: 'Create account' }).click();
		await newcomer.waitForURL(/\/signin\/check-email/);
		expect(await newcomer.getByTestId('check-email').textContent()).toContain('link to confirm');
		await newcomer.goto(await mailedLink(base, email, '/signup/confirm/'));
		await newcomer.getByRole('button', { name: 'Confirm and create my account' }).click();
		await newcomer.waitForURL(/confirmed=1/);
		await newcomer.getByLabel('Password').fill('spot lamps on the gantry');
		await newcomer.getByRole('button', { name: 'Sign in', exact: true }).click();
		await newcomer.waitForURL(`${base}/`);

		const owner = await stage.browser.page({ width: 1440, height: 900 });
		await signInPage(owner, base, 'owner@demo.test');
		const projectPath = new URL(owner.url()).pathname.startsWith('/projects/')
			? new URL(owner.url()).pathname
			: await owner.locator('a[href^="/projects/"]').first().getAttribute('href');
		const crewPage = `${base}${projectPath!.match(/^\/projects\/\d+/)![0]}/members`;
		await owner.goto(crewPage);
		await owner.getByLabel('Invite by e-mail').fill(email);
		await owner.getByLabel('Role', { exact: true }).selectOption('electrician');
		await owner.getByRole('button', { name: 'Send invitation' }).click();
		await expect.poll(() => owner.getByRole('status').textContent()).toContain('Invitation mailed');
		await owner.reload();
		expect(await owner.getByTestId('invitations').textContent()).toContain(email);
		await screenshot(owner, 'crew-page-desk');
		const ownerPhone = await stage.browser.page({ width: 390, height: 844 }, { mobile: true });
		await signInPage(ownerPhone, base, 'owner@demo.test');
		await ownerPhone.goto(crewPage);
		await screenshot(ownerPhone, 'crew-page-phone');

		await newcomer.goto(await mailedLink(base, email, '/invite/'));
		await newcomer.getByRole('button', { name: 'Join the project' }).click();
		await newcomer.waitForURL(/\/projects\/\d+$/);
		await owner.reload();
		expect(await owner.getByTestId('members').textContent()).toContain(email);
		expect(await owner.getByTestId('invitations').count()).toBe(0);

		await newcomer.goto(`${base}/account`);
		expect(await newcomer.getByTestId('account-email').textContent()).toBe(email);
		await screenshot(newcomer, 'account-page-phone');
		await owner.goto(`${base}/account`);
		expect(await owner.getByTestId('sole-owned').textContent()).toContain('only owner');
		await screenshot(owner, 'account-page-desk');
		for (const p of [newcomer, owner, ownerPhone]) await p.close();
	}, 120_000);
});
