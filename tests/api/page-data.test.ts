import { unflatten } from 'devalue';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { startServer, type Client, type TestServer } from '../helpers/server';
import type { PatchData } from '../../src/lib/shapes';
import { decodeTableFeed, type TableFeed } from '../../src/lib/table-feed';

// Pages read the same server functions as the JSON API (issue 14, "pages without a second trip"):
// what a page's load answers must be what its API route answers, so moving loads off
// event.fetch cannot change a page. The page's data is read from SvelteKit's __data.json.

let server: TestServer;
let pid: number;
let owner: Client;

/** The merged data of every load on the path (layouts and page), as plain JSON. */
async function pageData(client: Client, path: string): Promise<Record<string, unknown>> {
	const [pathname, query] = path.split('?');
	const res = await client.get(`${pathname.replace(/\/$/, '')}/__data.json${query ? `?${query}` : ''}`);
	expect(res.status, path).toBe(200);
	const body = (await res.json()) as { type: string; nodes: ({ type: string; data: unknown[] } | null)[] };
	expect(body.type, `${path}: ${JSON.stringify(body).slice(0, 200)}`).toBe('data');
	const merged: Record<string, unknown> = {};
	for (const node of body.nodes) if (node?.type === 'data') Object.assign(merged, unflatten(node.data));
	// the API answers JSON: compare what survives JSON (undefined members dropped)
	return JSON.parse(JSON.stringify(merged));
}

async function api<T>(client: Client, path: string): Promise<T> {
	const res = await client.get(path);
	expect(res.status, path).toBe(200);
	return (await res.json()) as T;
}

beforeAll(async () => {
	server = await startServer({ demo: true });
	pid = demoProjectId(server.db());
	owner = await server.signIn('owner@demo.test');
});
afterAll(() => server?.stop());

describe('page loads answer what the API answers', () => {
	it('the projects list and the project layout', async () => {
		const home = await pageData(owner, '/');
		expect(home.projects).toEqual((await api<{ projects: unknown[] }>(owner, '/api/projects')).projects);
		const overview = await pageData(owner, `/projects/${pid}`);
		expect(overview.project).toEqual(await api(owner, `/api/projects/${pid}`));
	});

	it('the overview counts the fixtures, states and open conflicts of GET …/patch', async () => {
		const p = await api<PatchData>(owner, `/api/projects/${pid}/patch`);
		const overview = await pageData(owner, `/projects/${pid}`);
		expect(overview.total).toBe(p.fixtures.length);
		const byState: Record<string, number> = {};
		for (const f of p.fixtures) byState[f.state] = (byState[f.state] ?? 0) + 1;
		expect(overview.byState).toEqual(byState);
		expect(overview.conflictCount).toBe(p.conflicts.filter((c) => c.severity !== 'info').length);
		expect((overview.universes as { number: number }[]).map((u) => u.number)).toEqual(p.universes.map((u) => u.number));
	});

	it('one fixture of each control kind reads the same on its page as in GET …/patch', async () => {
		const p = await api<PatchData>(owner, `/api/projects/${pid}/patch`);
		const kinds = ['dmx', 'dmx-map', 'rc', 'follow', 'manual'] as const;
		for (const kind of kinds) {
			const fixture = p.fixtures.find((f) => f.control.kind === kind);
			expect(fixture, `the demo has a ${kind} fixture`).toBeDefined();
			const page = await pageData(owner, `/projects/${pid}/fixtures/${fixture!.number}`);
			expect(page.fixture, kind).toEqual(fixture);
			expect(page.conflicts, kind).toEqual(p.conflicts.filter((c) => c.fixtureIds.includes(fixture!.id)));
			const c = fixture!.control;
			if (c.kind === 'dmx' || c.kind === 'dmx-map')
				expect(page.universe).toEqual(p.universes.find((u) => u.id === c.universeId));
			if (c.kind === 'rc') expect(page.receiver).toEqual(p.receivers.find((r) => r.id === c.receiverId));
		}
	});

	it('a universe page shows that universe, its fixtures and conflicts as GET …/patch has them', async () => {
		const p = await api<PatchData>(owner, `/api/projects/${pid}/patch`);
		for (const kind of ['dmx', 'dmx-map'] as const) {
			const f = p.fixtures.find((x) => x.control.kind === kind)!;
			const universe = p.universes.find((u) => f.control.kind === kind && u.id === f.control.universeId)!;
			const page = await pageData(owner, `/projects/${pid}/universes/${universe.number}`);
			expect(page.universe).toEqual(universe);
			const onIt = p.fixtures.filter(
				(x) => (x.control.kind === 'dmx' || x.control.kind === 'dmx-map') && x.control.universeId === universe.id
			);
			expect(page.fixtures).toEqual(
				onIt.map((x) => ({
					id: x.id,
					number: x.number,
					label: x.label,
					modeId: x.modeId,
					control: x.control,
					slots: x.slots
				}))
			);
			expect(page.conflicts).toEqual(p.conflicts.filter((c) => c.universeId === universe.id));
		}
	});

	it('the patch table: its lean feed decodes to GET …/patch (less the notes it does not show)', async () => {
		const p = await api<PatchData>(owner, `/api/projects/${pid}/patch`);
		expect(
			p.fixtures.some((f) => f.notes !== ''),
			'the demo has notes'
		).toBe(true);
		const page = await pageData(owner, `/projects/${pid}/patch`);
		expect(page.patch, 'no whole patch beside the lean feed').toBeUndefined();
		const decoded = decodeTableFeed(JSON.parse(page.feed as string) as TableFeed);
		expect(decoded).toEqual({ ...p, fixtures: p.fixtures.map((f) => ({ ...f, notes: '' })) });
		// the electrician reads the same table
		const electrician = await server.signIn('electrician@demo.test');
		expect(
			decodeTableFeed(JSON.parse((await pageData(electrician, `/projects/${pid}/patch`)).feed as string) as TableFeed)
		).toEqual(decoded);
	});

	it('the revisions page: revisions, review links and a diff', async () => {
		expect((await owner.post(`/api/projects/${pid}/revisions`, { note: 'first' })).status).toBe(201);
		const fixture = (await api<PatchData>(owner, `/api/projects/${pid}/patch`)).fixtures[0];
		const changed = await owner.patch(`/api/projects/${pid}/fixtures/${fixture.id}`, {
			label: `${fixture.label} (moved)`,
			version: fixture.version
		});
		expect(changed.status).toBe(200);
		expect((await owner.post(`/api/projects/${pid}/revisions`, { note: 'second' })).status).toBe(201);
		expect((await owner.post(`/api/projects/${pid}/review-links`, { revision: 1 })).status).toBe(201);

		const page = await pageData(owner, `/projects/${pid}/revisions?from=1&to=2`);
		expect(page.revisions).toEqual(
			(await api<{ revisions: unknown[] }>(owner, `/api/projects/${pid}/revisions`)).revisions
		);
		expect(page.links).toEqual(
			(await api<{ reviewLinks: unknown[] }>(owner, `/api/projects/${pid}/review-links`)).reviewLinks
		);
		const diff = await api<{ changed: unknown[] }>(owner, `/api/projects/${pid}/revisions/2/diff?against=1`);
		expect(diff.changed.length).toBeGreaterThan(0);
		expect(page.diff).toEqual(diff);

		// a comparison with a revision that does not exist: the API's 404 message, beside the list
		const missing = await owner.get(`/api/projects/${pid}/revisions/2/diff?against=9`);
		expect(missing.status).toBe(404);
		const stale = await pageData(owner, `/projects/${pid}/revisions?from=9&to=2`);
		expect(stale.diff).toBeNull();
		expect(stale.diffError).toBe(((await missing.json()) as { error: { message: string } }).error.message);
	});

	it('the types page lists the types of GET …/patch', async () => {
		const p = await api<PatchData>(owner, `/api/projects/${pid}/patch`);
		expect(p.types.length).toBeGreaterThan(0);
		const page = await pageData(owner, `/projects/${pid}/types`);
		expect(page.types).toEqual(p.types);
		expect(page.role).toBe('owner');
	});

	it('the review page answers what GET /api/review/:token answers, and refuses what it refuses', async () => {
		expect((await owner.post(`/api/projects/${pid}/revisions`, { note: 'for review' })).status).toBe(201);
		const made = await owner.post(`/api/projects/${pid}/review-links`, { revision: 'latest' });
		expect(made.status).toBe(201);
		const token = new URL(((await made.json()) as { url: string }).url).pathname.split('/').pop()!;
		const producer = server.anonymous();
		const page = await pageData(producer, `/review/${token}`);
		expect(page.review).toEqual(await api(producer, `/api/review/${token}`));

		// a token that does not exist: the page's error carries the API's status and message
		const forged = 'x'.repeat(token.length);
		const apiAnswer = await producer.get(`/api/review/${forged}`);
		const pageAnswer = await producer.get(`/review/${forged}/__data.json`);
		expect(apiAnswer.status).toBe(404);
		const pageBody = (await pageAnswer.json()) as {
			nodes: ({ type: string; status?: number; error?: { message: string } } | null)[];
		};
		const failed = pageBody.nodes.find((n) => n?.type === 'error');
		expect(failed?.status).toBe(404);
		expect(failed?.error?.message).toBe(((await apiAnswer.json()) as { error: { message: string } }).error.message);
	});

	it('the review page signs off through the same function as POST /api/review/:token/signoff', async () => {
		const made = await owner.post(`/api/projects/${pid}/review-links`, { revision: 'latest' });
		const token = new URL(((await made.json()) as { url: string }).url).pathname.split('/').pop()!;
		const producer = server.anonymous();
		const signoffs = async () =>
			(await api<{ revision: { signoffs: unknown[] } }>(producer, `/api/review/${token}`)).revision.signoffs.length;
		const before = await signoffs();
		const submit = (fields: Record<string, string>) =>
			producer.fetch(`/review/${token}?/signoff`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-sveltekit-action': 'true' },
				body: new URLSearchParams(fields).toString()
			});

		// no name: refused in the schema's words, the typed comment kept, nothing written
		const refused = (await (await submit({ name: ' ', decision: 'approved', comment: 'fine' })).json()) as {
			type: string;
			status: number;
			data: string;
		};
		expect(refused.type).toBe('failure');
		expect(refused.status).toBe(400);
		const failure = unflatten(JSON.parse(refused.data)) as { message: string; values: Record<string, string> };
		expect(failure.message).toBe('Tell us your name.');
		expect(failure.values.comment).toBe('fine');
		expect(await signoffs()).toBe(before);

		const accepted = (await (await submit({ name: 'Page Producer', decision: 'approved', comment: '' })).json()) as {
			type: string;
			location: string;
		};
		expect(accepted).toMatchObject({ type: 'redirect', location: `/review/${token}?signed=approved` });
		const after = (
			await api<{ revision: { signoffs: { name: string; decision: string }[] } }>(producer, `/api/review/${token}`)
		).revision.signoffs;
		expect(after.length).toBe(before + 1);
		expect(after.some((s) => s.name === 'Page Producer' && s.decision === 'approved')).toBe(true);
	});
});
