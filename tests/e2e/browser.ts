import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

// Headless Chromium for the e2e tests; a missing browser fails loudly, never skips.

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
export const SCREENSHOTS = join('test-results', 'screenshots');

export interface Browser {
	context: BrowserContext;
	close(): Promise<void>;
}

export async function launchBrowser(options: { viewport?: { width: number; height: number }; isMobile?: boolean } = {}): Promise<Browser> {
	if (!existsSync(CHROMIUM_PATH)) {
		throw new Error(`Chromium not found at ${CHROMIUM_PATH}. Install it with "apt-get update && apt-get install -y chromium" or set CHROMIUM_PATH.`);
	}
	mkdirSync(SCREENSHOTS, { recursive: true });
	const profile = mkdtempSync(join(tmpdir(), 'patchwright-chromium-'));
	const context = await chromium.launchPersistentContext(profile, {
		executablePath: CHROMIUM_PATH,
		headless: true,
		args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
		viewport: options.viewport ?? { width: 1280, height: 900 },
		isMobile: options.isMobile,
		hasTouch: options.isMobile
	});
	return {
		context,
		async close() {
			await context.close();
			rmSync(profile, { recursive: true, force: true });
		}
	};
}

/** Signs in through the /signin form, as a person would. */
export async function signInPage(page: Page, url: string, email: string, password = 'patchwright-demo'): Promise<void> {
	await page.goto(`${url}/signin`);
	await page.fill('#email', email);
	await page.fill('#password', password);
	await Promise.all([page.waitForURL((u) => !u.pathname.startsWith('/signin') && !u.pathname.startsWith('/auth')), page.click('button[type=submit]:has-text("Sign in")')]);
}
