// Patch-table bench: navigation to the first rows drawn for a 20,000-fixture
// project in headless Chromium, against a 1,500 ms target.
import { existsSync } from 'node:fs';
import { startServer } from '../../tests/helpers/server';
import { addMember, makeProject, makeUser, PASSWORD } from '../../tests/helpers/factories';
import { makeType, makeUniverse } from '../../tests/helpers/patch-factories';
import { CHROMIUM, launchBrowser, signInPage } from '../../tests/e2e/launch';
import { fixtures } from '../../src/lib/server/db/schema';
import type { Db } from '../../src/lib/server/db/index';
import type { BenchLine, BenchModule } from './harness';

const FIXTURES = 20_000;
const TARGET_MS = 1500;
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
	benches: ['table-20k'],
	async skip() {
		if (!existsSync('build/index.js')) return 'needs a build (npm run build)';
		if (!existsSync(CHROMIUM)) return `needs Chromium at ${CHROMIUM} (apt-get install -y chromium)`;
		return null;
	},
	async run(): Promise<BenchLine[]> {
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
			return [{ name: 'table-20k', value, unit: 'ms', ratio: value / TARGET_MS }];
		} finally {
			await browser.close();
			await server.stop();
		}
	}
};
