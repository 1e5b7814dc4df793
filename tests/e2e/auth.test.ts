import { describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../src/lib/server/demo';
import { demoStage, mailedLink, screenshot, signInPage } from './launch';

const stage = demoStage();

describe('signing in through the pages (Chromium)', () => {
	it.each(DEMO_USERS.map((u) => [u.role, u.email]))(
		'the demo %s signs in and sees the demo project',
		async (role, email) => {
			const page = await stage.browser.page();
			await signInPage(page, stage.server.url, email);
			await expect.poll(() => page.getByTestId('signed-in-as').textContent()).toBe(email);
			const card = page.getByTestId('project-list').getByRole('link');
			await expect.poll(() => card.count()).toBe(1);
			expect(await card.textContent()).toContain(role);
			if (role === 'owner') await screenshot(page, 'projects-list');
			await page.close();
		}
	);

	it('a wrong password shows a clear error and stays signed out', async () => {
		const page = await stage.browser.page();
		await page.goto(`${stage.server.url}/signin`);
		await page.getByLabel('E-mail', { exact: true }).fill('owner@demo.test');
		await page.getByLabel('Password').fill('wrong password');
		await page.getByRole('button', { name: 'Sign in', exact: true }).click();
		await page.waitForURL(/error=CredentialsSignin/);
		expect(await page.getByTestId('signin-error').textContent()).toContain('Wrong e-mail or password.');
		await screenshot(page, 'signin-wrong-password');
		await page.close();
	});

	it('a new person signs up, confirms by the mailed link, signs in, then creates a project they own', async () => {
		const page = await stage.browser.page({ width: 390, height: 844 });
		await page.goto(`${stage.server.url}/signup`);
		await page.getByLabel('Your name').fill('Bo Bestboy');
		await page.getByLabel('E-mail').fill('bo@crew.test');
		await page.getByLabel('Password').fill('rigging all night');
		await page.getByRole('button', { name: 'Create account' }).click();
		await page.waitForURL(/check-email/);
		await page.goto(await mailedLink(stage.server.url, 'bo@crew.test', '/signup/confirm/'));
		await page.getByRole('button', { name: 'Confirm and create my account' }).click();
		await page.waitForURL(/confirmed=1/);
		await page.getByLabel('Password').fill('rigging all night');
		await page.getByRole('button', { name: 'Sign in', exact: true }).click();
		await page.waitForURL(`${stage.server.url}/`);
		await page.getByRole('button', { name: 'New project' }).click();
		await page.getByLabel('Name').fill('Night shoot, car rig');
		await page.getByRole('button', { name: 'Create project' }).click();
		await page.waitForURL(/\/projects\/\d+$/);
		expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('Night shoot, car rig');
		await screenshot(page, 'new-project-phone');
		await page.close();
	});

	it('signing out returns to the sign-in page and project pages then need a sign-in', async () => {
		const page = await stage.browser.page();
		await signInPage(page, stage.server.url, 'viewer@demo.test');
		await page.getByRole('button', { name: 'Sign out' }).click();
		await page.waitForURL(/\/signin/);
		await page.goto(`${stage.server.url}/projects/1`);
		expect(new URL(page.url()).pathname).toBe('/signin');
		await page.close();
	});

	it('a fixture page opened from its label while signed out signs in and lands back on that fixture', async () => {
		const page = await stage.browser.page({ width: 390, height: 844 }, { mobile: true });
		await page.goto(`${stage.server.url}/projects/1/fixtures/106`);
		await page.waitForURL(/\/signin\?callbackUrl=/);
		await page.getByLabel('E-mail', { exact: true }).fill('electrician@demo.test');
		await page.getByLabel('Password').fill('patchwright-demo');
		await page.getByRole('button', { name: 'Sign in', exact: true }).click();
		await page.waitForURL(`${stage.server.url}/projects/1/fixtures/106`);
		expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('106');
		await page.close();
	});
});
