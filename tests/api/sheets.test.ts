import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { projects, revisions, signoffs } from '../../src/lib/server/db/schema';
import { MM } from '../../src/lib/server/pdf/common';
import { labelGrid } from '../../src/lib/server/pdf/label-sheet';
import { makeUser, PASSWORD } from '../helpers/factories';
import { decodeQr, pdfInfo, pdfPages, renderPage } from '../helpers/pdf';
import { startServer, type Client, type TestServer } from '../helpers/server';

interface Patch {
	project: { id: number; name: string };
	universes: { id: number; number: number }[];
	fixtures: {
		id: number;
		number: number;
		label: string;
		control: { kind: string; universeId?: number; receiverId?: number };
		slots: { start: number; end: number }[];
	}[];
	[k: string]: unknown;
}

let server: TestServer;
let electrician: Client;
let pid: number;
let patch: Patch;

async function pdf(client: Client, path: string): Promise<Uint8Array> {
	const res = await client.get(path);
	expect(
		res.status,
		await res
			.clone()
			.text()
			.catch(() => '')
	).toBe(200);
	expect(res.headers.get('content-type')).toBe('application/pdf');
	return new Uint8Array(await res.arrayBuffer());
}

beforeAll(async () => {
	server = await startServer({ demo: true });
	electrician = await server.signIn('electrician@demo.test');
	const list = (await (await electrician.get('/api/projects')).json()) as { projects: { id: number }[] };
	pid = list.projects[0].id;
	patch = (await (await electrician.get(`/api/projects/${pid}/patch`)).json()) as Patch;
});
afterAll(async () => {
	if (process.env.SHEETS_DEBUG) console.log(server.output());
	await server?.stop();
});

describe('patch sheet', () => {
	it('lists every DMX-patched fixture of the demo with its label and address, page n of m on each page', async () => {
		const res = await electrician.get(`/api/projects/${pid}/sheets/patch.pdf`);
		expect(res.headers.get('content-disposition')).toBe(
			'inline; filename="the-lantern-ferry-river-unit-patch-draft.pdf"'
		);
		const pages = await pdfPages(new Uint8Array(await res.arrayBuffer()));
		const all = pages.map((p) => p.text).join(' ');
		const number = new Map(patch.universes.map((u) => [u.id, u.number]));
		const dmx = patch.fixtures.filter((f) => f.control.kind === 'dmx');
		expect(dmx.length).toBeGreaterThan(30);
		for (const f of dmx) {
			expect(all).toContain(f.label);
			const r = f.slots[0];
			expect(all).toContain(`${number.get(f.control.universeId!)}.${r.start}–${r.end}`);
		}
		// the deliberate overlap of the demo is flagged and listed on the first page
		expect(pages[0].text).toMatch(/Conflicts \(\d+\)/);
		expect(pages[0].text).toContain('ERROR');
		pages.forEach((p, i) => {
			expect(p.text).toContain(`Page ${i + 1} of ${pages.length}`);
			expect(p.text).toContain('The Lantern Ferry');
			expect(p.text).toContain('Draft');
		});
	});

	it('fits the demo at 30 or more rows a page, and lists absolute per-parameter addresses on request (issue 19)', async () => {
		const pages = await pdfPages(await pdf(electrician, `/api/projects/${pid}/sheets/patch.pdf`));
		expect(pages.length).toBeLessThanOrEqual(Math.ceil(patch.fixtures.length / 30));
		const absolute = (await pdfPages(await pdf(electrician, `/api/projects/${pid}/sheets/patch.pdf?channels=absolute`)))
			.map((p) => p.text)
			.join(' ')
			.replace(/\s+/g, ' ');
		// every DMX fixture's first parameter at its own universe.address
		const number = new Map(patch.universes.map((u) => [u.id, u.number]));
		for (const f of patch.fixtures.filter((x) => x.control.kind === 'dmx'))
			expect(absolute).toContain(`${number.get(f.control.universeId!)}.${f.slots[0].start}`);
		expect(absolute).toContain('Channels (universe.address parameter)');
		const bad = await electrician.get(`/api/projects/${pid}/sheets/labels.pdf?channels=absolute`);
		expect(bad.status).toBe(400);
	});

	it('embeds IBM Plex Sans (a FontFile2 stream) and carries title, author and creation date', async () => {
		const data = await pdf(electrician, `/api/projects/${pid}/sheets/patch.pdf?paper=letter`);
		const raw = Buffer.from(data).toString('latin1');
		expect(raw).toMatch(/\/FontFile2/);
		const names = [...raw.matchAll(/\/BaseFont \/([^\s/<>[\]]+)/g)].map((m) => m[1]);
		expect(names.length).toBeGreaterThan(0);
		for (const n of names) expect(n).toMatch(/^[A-Z]{6}\+IBMPlexSans-(Regular|SemiBold)$/);
		const info = await pdfInfo(data);
		expect(String(info.Title)).toContain('Patch sheet');
		expect(info.Author).toBe('Patchwright');
		expect(String(info.CreationDate)).toMatch(/^D:\d{14}/);
		// US Letter, landscape: 11 × 8.5 in
		const [page] = await pdfPages(data);
		expect([Math.round(page.width), Math.round(page.height)]).toEqual([792, 612]);
	});

	it('prints a revision from its snapshot, with its sign-off state, and 404s an unknown revision', async () => {
		const db = server.db();
		const author = await makeUser(db);
		const project = db.select().from(projects).where(eq(projects.id, pid)).get()!;
		// the agreed snapshot format: the arguments of computeFor
		const snapshot = {
			project: { ...patch.project, name: project.name },
			universes: patch.universes,
			types: patch.types,
			receivers: patch.receivers,
			fixtures: patch.fixtures.map((f, i) => (i === 0 ? { ...f, label: 'SNAPSHOT ONLY' } : f))
		};
		const r1 = db
			.insert(revisions)
			.values({ projectId: pid, number: 1, authorId: author.id, authorName: 'Pim', snapshot })
			.returning()
			.get();
		db.insert(signoffs)
			.values({
				projectId: pid,
				revisionId: r1.id,
				decision: 'approved',
				name: 'Petra Producer',
				createdAt: new Date('2026-04-02T12:00:00Z')
			})
			.run();

		const res = await electrician.get(`/api/projects/${pid}/sheets/patch.pdf?revision=1`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-disposition')).toContain('the-lantern-ferry-river-unit-patch-r1.pdf');
		let text = (await pdfPages(new Uint8Array(await res.arrayBuffer()))).map((p) => p.text).join(' ');
		expect(text).toContain('SNAPSHOT ONLY');
		expect(text).toContain('Revision 1');
		expect(text).toContain('r1 approved by Petra Producer on 2026-04-02');

		db.insert(revisions).values({ projectId: pid, number: 2, authorId: author.id, authorName: 'Pim', snapshot }).run();
		text = (await pdfPages(await pdf(electrician, `/api/projects/${pid}/sheets/radio.pdf?revision=1`)))
			.map((p) => p.text)
			.join(' ');
		expect(text).toContain('stale');
		expect(text).toContain('r2 is newer');

		const missing = await electrician.get(`/api/projects/${pid}/sheets/patch.pdf?revision=99`);
		expect(missing.status).toBe(404);
		expect(((await missing.json()) as { error: { code: string } }).error.code).toBe('not-found');
	});
});

describe('label sheet', () => {
	it('puts one QR code per fixture on the grid, each opening that fixture’s page', async () => {
		const data = await pdf(electrician, `/api/projects/${pid}/sheets/labels.pdf`);
		const pages = await pdfPages(data);
		const sorted = [...patch.fixtures].sort((a, b) => a.number - b.number);
		expect(pages.length).toBe(Math.ceil(sorted.length / 24));
		const dpi = 200;
		const px = dpi / 72;
		const grid = labelGrid('a4');
		for (let p = 0; p < pages.length; p++) {
			const png = await renderPage(data, p + 1, dpi);
			const onPage = sorted.slice(p * 24, p * 24 + 24);
			onPage.forEach((f, i) => {
				const x = grid.left + (i % 3) * grid.width;
				const y = grid.top + Math.floor(i / 3) * grid.height;
				// the QR sits in the right part of the cell; crop just inside the cut lines
				const decoded = decodeQr(
					png,
					(x + grid.width * 0.45) * px,
					(y + 0.5 * MM) * px,
					grid.width * 0.55 * px - 2,
					(grid.height - 1 * MM) * px
				);
				expect(decoded, `label of fixture ${f.number}`).toBe(`${server.url}/projects/${pid}/fixtures/${f.number}`);
				expect(pages[p].text).toContain(f.label);
			});
		}
	}, 60_000);

	it('prints a chosen set of fixtures on US Letter, and refuses unknown numbers', async () => {
		const [a, b] = patch.fixtures;
		const pages = await pdfPages(
			await pdf(electrician, `/api/projects/${pid}/sheets/labels.pdf?fixtures=${b.number},${a.number}&paper=letter`)
		);
		expect(pages.length).toBe(1);
		expect(Math.round(pages[0].width)).toBe(612);
		expect(pages[0].text).toContain(a.label);
		expect(pages[0].text).toContain(b.label);
		expect(pages[0].text).not.toContain(patch.fixtures[2].label);
		const bad = await electrician.get(`/api/projects/${pid}/sheets/labels.pdf?fixtures=99999`);
		expect(bad.status).toBe(400);
		expect(((await bad.json()) as { error: { message: string } }).error.message).toContain('99999');
	});
});

describe('radio sheet', () => {
	it('lists every RC fixture, the SBUS value range and the failsafe caution', async () => {
		const text = (await pdfPages(await pdf(electrician, `/api/projects/${pid}/sheets/radio.pdf`)))
			.map((p) => p.text)
			.join(' ');
		const rc = patch.fixtures.filter((f) => f.control.kind === 'rc');
		expect(rc.length).toBeGreaterThan(0);
		for (const f of rc) expect(text).toContain(`${f.number} ${f.label}`);
		// SBUS raw 172–1811 ↔ 988–2012 µs (common practice of open RC firmware)
		// pdf.js reads the micro sign back as Greek mu; compare compatibility forms
		expect(text.normalize('NFKC')).toContain('raw 172–1811 · 988–2012 µs'.normalize('NFKC'));
		expect(text).toMatch(/failsafe/);
	});
});

describe('power sheet', () => {
	it('says each warning in words, without its code, and prints every swap time (issue 19)', async () => {
		const text = (await pdfPages(await pdf(electrician, `/api/projects/${pid}/sheets/power.pdf`)))
			.map((p) => p.text)
			.join(' ')
			.replace(/\s+/g, ' ');
		// the demo's saloon circuit carries 2,400 W on a 10 A breaker at 230 V: over 100 %
		expect(text).toContain('Saloon practicals (B10)');
		expect(text).not.toMatch(/circuit-over|air-travel-|no-power-data|over-current|voltage-range/);
		expect(text).not.toContain('…');
	});
});

describe('access', () => {
	it('lets every role print, answers 401 signed out, 404 to outsiders and 400 to a bad paper size', async () => {
		for (const who of ['viewer', 'programmer', 'owner']) {
			const client = await server.signIn(`${who}@demo.test`);
			expect(
				(await client.get(`/api/projects/${pid}/sheets/labels.pdf?fixtures=${patch.fixtures[0].number}`)).status
			).toBe(200);
		}
		expect((await server.anonymous().get(`/api/projects/${pid}/sheets/patch.pdf`)).status).toBe(401);
		const outsider = await makeUser(server.db(), { email: `outsider-${Date.now()}@test.example` });
		const stranger = await server.signIn(outsider.email!, PASSWORD);
		const res = await stranger.get(`/api/projects/${pid}/sheets/patch.pdf`);
		expect(res.status).toBe(404);
		const bad = await electrician.get(`/api/projects/${pid}/sheets/patch.pdf?paper=a3`);
		expect(bad.status).toBe(400);
		expect(((await bad.json()) as { error: { code: string } }).error.code).toBe('invalid');
	});
});
