import { readFileSync } from 'node:fs';
import type { BrowserContext, Page } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { hydrated, patchRows } from './helpers';
import { demoStage, screenshot, signInPage } from './launch';

// Issue 19: axe-core (WCAG 2.1 A and AA rules) finds nothing on any page of the app, each visited by
// the role that uses it, at a desk (1440 × 900) and on a phone (390 × 844), in the light, dark and
// night themes. The night theme is stored as `dim` (DEVELOPERS.md "Theme").

const stage = demoStage();
const AXE = readFileSync('node_modules/axe-core/axe.min.js', 'utf8');
const VIEWPORTS = {
	desk: { width: 1440, height: 900, mobile: false },
	phone: { width: 390, height: 844, mobile: true }
} as const;
const THEMES = ['light', 'dark', 'dim'] as const;
type Who = 'nobody' | 'owner' | 'programmer' | 'electrician';

interface Visit {
	path: string;
	who: Who;
	/** what shows the page has drawn its data */
	ready?: (page: Page) => Promise<void>;
}

let visits: Visit[] = [];
const sessions = new Map<Who, Awaited<ReturnType<BrowserContext['storageState']>>>();

beforeAll(async () => {
	const server = stage.server;
	const pid = demoProjectId(server.db());
	const programmer = await server.signIn('programmer@demo.test');
	expect((await programmer.post(`/api/projects/${pid}/revisions`, { note: 'For the review page' })).status).toBe(201);
	const link = (await (await programmer.post(`/api/projects/${pid}/review-links`, { revision: 'latest' })).json()) as {
		url: string;
	};
	// a link that has decided: its page shows the decision instead of the form
	const decided = (await (await programmer.post(`/api/projects/${pid}/review-links`, { revision: 1 })).json()) as {
		url: string;
	};
	const decidedPath = new URL(decided.url).pathname;
	const signed = await server.anonymous().post(`/api/review/${decidedPath.split('/').pop()}/signoff`, {
		name: 'Axe Producer',
		decision: 'approved',
		comment: ''
	});
	expect(signed.status).toBe(201);
	const p = `/projects/${pid}`;
	visits = [
		{ path: '/signin', who: 'nobody' },
		{ path: '/signin/check-email', who: 'nobody' },
		{ path: '/signup', who: 'nobody' },
		{ path: '/signup/confirm/not-a-real-token', who: 'nobody' },
		{ path: '/account/password', who: 'nobody' },
		{ path: '/account/password/not-a-real-token', who: 'nobody' },
		{ path: '/invite/not-a-real-token', who: 'nobody' },
		{ path: new URL(link.url).pathname, who: 'nobody' },
		{ path: decidedPath, who: 'nobody', ready: (pg) => pg.getByTestId('link-decision').waitFor() },
		{ path: '/', who: 'programmer' },
		{ path: '/account', who: 'programmer' },
		{ path: p, who: 'programmer' },
		{ path: `${p}/patch`, who: 'programmer', ready: patchRows },
		// fixtures selected: the selection toolbar, its More panel open on a phone
		{ path: `${p}/patch?selected`, who: 'programmer', ready: selectionOpen },
		{ path: `${p}/universes`, who: 'programmer' },
		{ path: `${p}/universes/3`, who: 'programmer', ready: (pg) => pg.locator('[data-slot-map]').waitFor() },
		{ path: `${p}/radio`, who: 'programmer' },
		{ path: `${p}/types`, who: 'programmer' },
		{ path: `${p}/revisions`, who: 'programmer' },
		{ path: `${p}/import`, who: 'programmer' },
		{ path: `${p}/power`, who: 'programmer' },
		{ path: `${p}/members`, who: 'owner' },
		{ path: `${p}/settings`, who: 'owner' },
		{ path: `${p}/fixtures/106`, who: 'electrician' },
		{ path: `${p}/fixtures/142`, who: 'electrician' },
		{ path: '/dev/mail', who: 'nobody' }
	];
	// one sign-in per role, its cookies reused by every page of that role
	for (const who of ['owner', 'programmer', 'electrician'] as const) {
		const context = await stage.browser.browser.newContext();
		const page = await context.newPage();
		await signInPage(page, server.url, `${who}@demo.test`);
		sessions.set(who, await context.storageState());
		await context.close();
	}
});

async function selectionOpen(page: Page): Promise<void> {
	await patchRows(page);
	await hydrated(page);
	for (const n of [104, 105]) await page.getByLabel(`Select fixture ${n}`).check();
	const more = page.getByRole('toolbar', { name: 'Selected fixtures' }).getByRole('button', { name: 'More' });
	if (await more.isVisible()) {
		await more.click();
		await page.locator('[data-selection-more] button').first().waitFor();
	}
}

/** The violations on the page, and whether the text-contrast rule ran at all (a page with no text checked would pass vacuously). */
async function axe(page: Page): Promise<{ violations: string[]; contrastChecked: boolean }> {
	// through the DevTools protocol: the app's CSP (rightly) refuses injected script tags
	await page.evaluate(AXE);
	return page.evaluate(async () => {
		const w = window as unknown as {
			axe: {
				run: (
					c: unknown,
					o: unknown
				) => Promise<{
					violations: { id: string; nodes: { target: string[]; failureSummary?: string }[] }[];
					passes: { id: string }[];
				}>;
			};
		};
		const r = await w.axe.run(document, {
			runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] }
		});
		return {
			violations: r.violations.map(
				(v) => `${v.id} ×${v.nodes.length} e.g. ${v.nodes[0]?.target.join(' ')}: ${v.nodes[0]?.failureSummary ?? ''}`
			),
			contrastChecked: [...r.passes, ...r.violations].some((x) => x.id === 'color-contrast')
		};
	});
}

describe('axe-core (WCAG 2.1 A/AA) on every page', () => {
	for (const [name, vp] of Object.entries(VIEWPORTS))
		for (const theme of THEMES)
			it(`${name} ${vp.width}×${vp.height}, ${theme === 'dim' ? 'night' : theme} theme: no violations`, async () => {
				const found: string[] = [];
				const contexts = new Map<Who, BrowserContext>();
				try {
					for (const visit of visits) {
						let context = contexts.get(visit.who);
						if (!context) {
							context = await stage.browser.browser.newContext({
								viewport: { width: vp.width, height: vp.height },
								isMobile: vp.mobile,
								hasTouch: vp.mobile,
								...(visit.who === 'nobody' ? {} : { storageState: sessions.get(visit.who) })
							});
							// the theme as the app keeps it (a cookie read on the server), so pages draw in it from the start
							await context.addCookies([{ name: 'pw-theme', value: theme, url: stage.server.url }]);
							contexts.set(visit.who, context);
						}
						const page = await context.newPage();
						const res = await page.goto(`${stage.server.url}${visit.path}`);
						expect(res?.status(), visit.path).toBeLessThan(500);
						expect(await page.evaluate(() => document.documentElement.dataset.theme), visit.path).toBe(theme);
						await visit.ready?.(page);
						const result = await axe(page);
						expect(result.contrastChecked, `${visit.path}: axe checked text contrast`).toBe(true);
						found.push(...result.violations.map((v) => `${visit.path} (${visit.who}): ${v}`));
						if (process.env.A11Y_SCREENSHOTS)
							await screenshot(page, `a11y-${name}-${theme}-${visit.path.replace(/\W+/g, '_')}`);
						await page.close();
					}
				} finally {
					for (const c of contexts.values()) await c.close();
				}
				expect(found).toEqual([]);
			}, 240_000);
});
