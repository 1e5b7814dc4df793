// Patch-table benches on a 20,000-fixture project in headless Chromium:
//   table-20k        navigation to the first rows drawn, against a 1,500 ms target;
//   table-20k-bytes  bytes of the table's first load (the page's lean feed), target ≤ 2,000,000;
//                    ratio = those bytes ÷ the full GET …/patch JSON;
//   live-update-ms   one client's PATCH answered → the change drawn in another client's open table,
//                    median of 20, target ≤ 300 ms (ratio against it).
import { existsSync } from 'node:fs';
import { startServer } from '../../tests/helpers/server';
import { addMember, makeProject, makeUser, PASSWORD } from '../../tests/helpers/factories';
import { makeType, makeUniverse } from '../../tests/helpers/patch-factories';
import { CHROMIUM, launchBrowser, signInPage } from '../../tests/e2e/launch';
import { and, eq } from 'drizzle-orm';
import { fixtures } from '../../src/lib/server/db/schema';
import type { Db } from '../../src/lib/server/db/index';
import type { BenchLine, BenchModule } from './harness';

const FIXTURES = 20_000;
const TARGET_MS = 1500;
const LIVE_TARGET_MS = 300;
const PER_UNIVERSE = 128; // 4-slot mode: 128 × 4 = 512

export async function buildRig(db: Db) {
	const user = await makeUser(db);
	const project = makeProject(db);
	addMember(db, project.id, user.id, 'programmer');
	const { type, modeIds } = makeType(db, project.id, {
		'HSIC 8-bit': [
			{ offset: 1, parameter: 'intensity' },
			{ offset: 2, parameter: 'hue' },
			{ offset: 3, parameter: 'saturation' },
			{ offset: 4, parameter: 'cct' }
		]
	});
	const universeIds: number[] = [];
	for (let u = 0; u < Math.ceil(FIXTURES / PER_UNIVERSE); u++) universeIds.push(makeUniverse(db, project.id, u + 1).id);
	db.transaction((tx) => {
		for (let start = 0; start < FIXTURES; start += 500) {
			const rows = [];
			for (let i = start; i < Math.min(FIXTURES, start + 500); i++) {
				rows.push({
					projectId: project.id,
					number: i + 1,
					label: `UNIT ${i + 1}`,
					typeId: type.id,
					modeId: modeIds['HSIC 8-bit'],
					controlKind: 'dmx' as const,
					universeId: universeIds[Math.floor(i / PER_UNIVERSE)],
					address: 1 + (i % PER_UNIVERSE) * 4,
					position: `truss ${i % 40}`,
					groupName: `group ${i % 12}`
				});
			}
			tx.insert(fixtures).values(rows).run();
		}
	});
	return { email: user.email ?? '', projectId: project.id };
}

export const table: BenchModule = {
	name: 'table',
	benches: ['table-20k', 'table-20k-bytes', 'live-update-ms'],
	async skip() {
		if (!existsSync('build/index.js')) return 'needs a build (npm run build)';
		if (!existsSync(CHROMIUM)) return `needs Chromium at ${CHROMIUM} (apt-get install -y chromium)`;
		return null;
	},
	async run(options = {}): Promise<BenchLine[]> {
		const wants = (name: string) => !options.filter || name.includes(options.filter);
		const server = await startServer({ demo: false });
		const browser = await launchBrowser();
		try {
			const { email, projectId } = await buildRig(server.db());
			const page = await browser.page({ width: 1366, height: 900 });
			await signInPage(page, server.url, email, PASSWORD);
			const url = `${server.url}/projects/${projectId}/patch`;
			const samples: number[] = [];
			for (let i = 0; i < 4; i++) {
				await page.goto('about:blank');
				const t = performance.now();
				await page.goto(url, { waitUntil: 'commit' });
				await page.locator('[data-row]').first().waitFor({ timeout: 30_000 });
				samples.push(performance.now() - t);
			}
			const drawn = await page.locator('[data-row]').count();
			if (drawn > 200) throw new Error(`windowing failed: ${drawn} rows in the DOM`);
			// first run warms the server's caches; median of the rest
			const timed = samples.slice(1).sort((a, b) => a - b);
			const value = Math.round(timed[1]);
			const lines: BenchLine[] = [];
			if (wants('table-20k')) lines.push({ name: 'table-20k', value, unit: 'ms', ratio: value / TARGET_MS });

			if (wants('table-20k-bytes')) {
				// what the page's first load carries (all its loads' data), against the whole patch as JSON
				const lean = (await (await page.request.get(`${url}/__data.json`)).body()).length;
				const full = (await (await page.request.get(`${server.url}/api/projects/${projectId}/patch`)).body()).length;
				lines.push({ name: 'table-20k-bytes', value: lean, unit: 'bytes', ratio: lean / full });
			}

			if (wants('live-update-ms')) {
				const writer = await server.signIn(email, PASSWORD);
				const first = server
					.db()
					.select()
					.from(fixtures)
					.where(and(eq(fixtures.projectId, projectId), eq(fixtures.number, 1)))
					.get()!;
				let version = first.version;
				const live: number[] = [];
				for (let i = 0; i < 21; i++) {
					const label = `LIVE ${i}`;
					// watch the first row for the new label before the write goes out
					// (a string, not a function: tsx's helpers would not exist in the page; it ends in 0 so evaluate
					// does not wait for the promise); NaN after 15 s
					await page.evaluate(
						`window.seenAt = new Promise((resolve) => {
							new MutationObserver(() => {
								if (document.querySelector('[data-row]')?.textContent?.includes(${JSON.stringify(label)})) resolve(Date.now());
							}).observe(document.body, { subtree: true, childList: true, characterData: true });
							setTimeout(() => resolve(NaN), 15000);
						}); 0`
					);
					const res = await writer.patch(`/api/projects/${projectId}/fixtures/${first.id}`, { label, version });
					const answered = Date.now();
					if (res.status !== 200) throw new Error(`PATCH answered ${res.status}`);
					version++;
					const seen = (await page.evaluate('window.seenAt')) as number;
					// the first write warms the encoder after the page's load; median of the other 20
					if (i > 0 && !Number.isNaN(seen)) live.push(Math.max(0, seen - answered));
				}
				// a change never drawn is a failure, not a slow sample
				if (live.length < 20) throw new Error(`${20 - live.length} of 20 live changes never reached the table`);
				live.sort((a, b) => a - b);
				const median = (live[9] + live[10]) / 2;
				lines.push({ name: 'live-update-ms', value: median, unit: 'ms', ratio: median / LIVE_TARGET_MS });
			}
			return lines;
		} finally {
			await browser.close();
			await server.stop();
		}
	}
};
