import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

// Browser tests drive Debian's Chromium against the built server. A missing
// binary is a failure with the fix in the message, never a skip.

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
const ARGS = [
	'--headless',
	'--no-sandbox',
	'--disable-gpu',
	'--disable-quic',
	'--no-first-run',
	'--disable-background-networking',
	'--disable-component-update',
	'--disable-sync'
];

export interface Browser {
	context: BrowserContext;
	close(): Promise<void>;
}

export async function launch(): Promise<Browser> {
	if (!existsSync(CHROMIUM_PATH)) {
		throw new Error(
			`Chromium not found at ${CHROMIUM_PATH}. Install it with \`apt-get update && apt-get install -y chromium\` or set CHROMIUM_PATH.`
		);
	}
	const dir = mkdtempSync(join(tmpdir(), 'patchwright-chromium-'));
	const context = await chromium.launchPersistentContext(dir, { executablePath: CHROMIUM_PATH, args: ARGS, headless: true });
	return {
		context,
		async close() {
			await context.close();
			rmSync(dir, { recursive: true, force: true });
		}
	};
}

export async function newPage(b: Browser, width = 1366, height = 900): Promise<Page> {
	const page = await b.context.newPage();
	await page.setViewportSize({ width, height });
	return page;
}

/** Signs in through the /signin form, as a person would. */
export async function signIn(page: Page, baseUrl: string, email: string, password = 'patchwright-demo'): Promise<void> {
	await page.goto(`${baseUrl}/signin`);
	await page.fill('#email', email);
	await page.fill('#password', password);
	await Promise.all([page.waitForURL((u) => !u.pathname.startsWith('/signin') && !u.pathname.startsWith('/auth')), page.click('button[type=submit]')]);
}

export async function screenshot(page: Page, name: string): Promise<string> {
	const dir = resolve('test-results/screenshots');
	mkdirSync(dir, { recursive: true });
	const path = join(dir, `${name}.png`);
	await page.screenshot({ path, fullPage: false });
	return path;
}
