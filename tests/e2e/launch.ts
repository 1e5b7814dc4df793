import { existsSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { chromium, type Browser as PlaywrightBrowser, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';

// Debian's Chromium, headless, with the flags this closed network needs
// (without the background-networking ones it floods refused connections).

export const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
const FLAGS = [
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
	browser: PlaywrightBrowser;
	/** A page in a context of its own: no cookies shared with other pages. */
	page(viewport?: { width: number; height: number }, options?: { mobile?: boolean }): Promise<Page>;
	close(): Promise<void>;
}

export async function launchBrowser(): Promise<Browser> {
	if (!existsSync(CHROMIUM)) {
		throw new Error(
			`Chromium not found at ${CHROMIUM}. Install Debian's package (apt-get install -y chromium) or set CHROMIUM_PATH. Browser tests never skip.`
		);
	}
	// Playwright gives every launch a fresh temporary user-data dir of its own.
	const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: FLAGS });
	return {
		browser,
		async page(viewport = { width: 1280, height: 800 }, { mobile = false } = {}) {
			const context = await browser.newContext({ viewport, isMobile: mobile, hasTouch: mobile });
			const page = await context.newPage();
			// the browser may already be closing the context itself; that is not a failure
			page.once('close', () => void context.close().catch(() => undefined));
			return page;
		},
		close: () => browser.close()
	};
}

/** Signs in through the /signin form, as a person would. */
export async function signInPage(
	page: Page,
	base: string,
	email: string,
	password = 'patchwright-demo'
): Promise<void> {
	await page.goto(`${base}/signin`);
	await page.getByLabel('E-mail', { exact: true }).fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in', exact: true }).click();
	await page.waitForURL((url) => !url.pathname.startsWith('/signin') && !url.pathname.startsWith('/auth'));
}

export async function screenshot(page: Page, name: string): Promise<string> {
	const dir = join('test-results', 'screenshots');
	mkdirSync(dir, { recursive: true });
	const path = join(dir, `${name}.png`);
	await page.screenshot({ path, fullPage: true });
	return path;
}

/** The demo served and a browser launched for a whole test file, both stopped after it. */
export function demoStage(): { readonly server: TestServer; readonly browser: Browser } {
	let server: TestServer | undefined;
	let browser: Browser | undefined;
	beforeAll(async () => {
		server = await startServer({ demo: true });
		browser = await launchBrowser();
	});
	afterAll(async () => {
		await browser?.close();
		await server?.stop();
	});
	return {
		get server() {
			if (!server) throw new Error('the demo server is not started yet');
			return server;
		},
		get browser() {
			if (!browser) throw new Error('the browser is not launched yet');
			return browser;
		}
	};
}

/** The newest link to `path` in mail the local sink caught for `to` (read from /dev/mail.json). */
export async function mailedLink(base: string, to: string, path: string): Promise<string> {
	for (let i = 0; i < 100; i++) {
		const mails = (await (await fetch(`${base}/dev/mail.json`)).json()) as { to: string; text: string }[];
		for (const mail of mails) {
			const link = mail.to.includes(to) ? mail.text.match(new RegExp(`https?://\\S+${path}\\S+`))?.[0] : undefined;
			if (link) return link;
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail to ${to} with a ${path} link`);
}
