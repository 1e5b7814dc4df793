import type { Page } from 'playwright-core';
import { screenshot, signInPage, type Browser } from './launch';

// The table pages' browser helpers, on top of the shared Chromium launcher
// (launch.ts: Debian Chromium, fails with the install command when missing).

export { screenshot, type Browser };

export function newPage(b: Browser, width = 1366, height = 900, mobile = false): Promise<Page> {
	return b.page({ width, height }, { mobile });
}

export const signIn = signInPage;

/** Waits until the page's scripts have hydrated it (the root layout marks <html data-ready>). */
export async function hydrated(page: Page): Promise<void> {
	await page.locator('html[data-ready]').waitFor({ state: 'attached', timeout: 15_000 });
}

/** Waits until the windowed patch table has drawn its first rows. */
export async function patchRows(page: Page): Promise<void> {
	await page.locator('[data-row]').first().waitFor({ timeout: 15_000 });
}
