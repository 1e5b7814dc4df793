import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, PASSWORD } from '../helpers/factories';
import { fingerprint } from '../helpers/fingerprint';
import { Client, startServer, type TestServer } from '../helpers/server';
import { reviewLinks } from '../../src/lib/server/db/schema';
import { hashToken, newToken } from '../../src/lib/server/tokens';
import {
	ACTIONS,
	actionExpect,
	CALLERS,
	makeCtx,
	PAGES,
	ROUTES,
	type ActionRow,
	type Caller,
	type Ctx,
	type Req,
	type Row
} from './authz.table';

// The authorization matrix (DESIGN.md "Roles": every API route and page load checks the
// role on the server). Routes are discovered from the file system, so a route without a
// line in authz.table.ts — or a line for a route that is gone — fails here.

const ROOT = 'src/routes';
const METHOD = /export\s+(?:const|async\s+function|function)\s+(GET|POST|PATCH|PUT|DELETE)\b/g;

/** `src/routes/api/(group)/x/[id]/+server.ts` → `/api/x/[id]` (route groups take no URL segment). */
function routeId(file: string): string {
	const dir = file.slice(ROOT.length).replace(/\/\+[^/]+$/, '');
	const path = dir
		.split('/')
		.filter((s) => s && !/^\(.*\)$/.test(s))
		.map((s) => s.replace(/=\w+\]$/, ']')) // a param matcher ([pid=int]) is not part of the route's name
		.join('/');
	return `/${path}`;
}

function discover() {
	const files = (readdirSync(ROOT, { recursive: true }) as string[]).map((f) => join(ROOT, f).split('\\').join('/'));
	const endpoints = new Set<string>();
	for (const f of files.filter((x) => x.endsWith('/+server.ts') || x.endsWith('/+server.js'))) {
		for (const m of readFileSync(f, 'utf8').matchAll(METHOD)) endpoints.add(`${m[1]} ${routeId(f)}`);
	}
	const pages = new Set(
		files.filter((x) => /\/\+page(\.server)?\.(ts|js|svelte)$/.test(x)).map((f) => `GET ${routeId(f)}`)
	);
	// form actions: the top-level keys of `export const actions = { … }` (one tab deep, as prettier lays them out)
	const actions = new Set<string>();
	for (const f of files.filter((x) => /\/\+page\.server\.(ts|js)$/.test(x))) {
		const text = readFileSync(f, 'utf8');
		const at = text.search(/export\s+const\s+actions\b/);
		if (at < 0) continue;
		for (const m of text.slice(at).matchAll(/^\t(\w+)\s*:/gm)) actions.add(`POST ${routeId(f)}?/${m[1]}`);
	}
	return { endpoints, pages, actions };
}

class ReviewHolder extends Client {
	constructor(
		base: string,
		private token: string
	) {
		super(base);
		this.cookies.set('pw-review', token);
	}
	override fetch(path: string, init: RequestInit = {}): Promise<Response> {
		const headers = new Headers(init.headers);
		headers.set('authorization', `Bearer ${this.token}`);
		return super.fetch(path, { ...init, headers });
	}
}

let server: TestServer;
let ctx: Ctx;
let foreign: Ctx;
let reviewToken: string;
const as = {} as Record<Caller, Client>;
let signInAgain: () => Promise<void>;

beforeAll(async () => {
	server = await startServer();
	const db = server.db();
	const { project, crew } = await makeCrew(db);
	const other = await makeCrew(db);
	for (const role of ['owner', 'programmer', 'electrician', 'viewer'] as const)
		as[role] = await server.signIn(crew[role].email, PASSWORD);
	// the outsider owns another project: "a member somewhere" is not "a member here"
	as.outsider = await server.signIn(other.crew.owner.email, PASSWORD);
	// after "sign out everywhere": the same clients (ctx holds the owners') sign in afresh
	signInAgain = async () => {
		for (const role of ['owner', 'programmer', 'electrician', 'viewer'] as const) {
			as[role].cookies.clear();
			await as[role].signIn(crew[role].email, PASSWORD);
		}
		as.outsider.cookies.clear();
		await as.outsider.signIn(other.crew.owner.email, PASSWORD);
	};
	as.anonymous = server.anonymous();
	reviewToken = newToken();
	db.insert(reviewLinks)
		.values({ projectId: project.id, tokenHash: hashToken(reviewToken), label: 'authz probe' })
		.run();
	as.review = new ReviewHolder(server.url, reviewToken);
	ctx = await makeCtx(db, project.id, as.owner, crew);
	foreign = await makeCtx(db, other.project.id, as.outsider, other.crew);
	// revision 1 in both projects, for the revision, review-link and sheet lines
	for (const [client, pid] of [
		[as.owner, project.id],
		[as.outsider, other.project.id]
	] as const) {
		const res = await client.post(`/api/projects/${pid}/revisions`, { note: 'authz baseline' });
		if (res.status !== 201) throw new Error(`setup: revision answered ${res.status}`);
	}
}, 120_000);
afterAll(() => server?.stop());

function url(row: Row, req: Req, pid: number): string {
	const params: Record<string, string | number> = { pid, id: pid, token: reviewToken, ...req.params };
	const path = row.route.replace(/\[(\w+)\]/g, (_, name: string) => {
		if (params[name] === undefined) throw new Error(`no value for [${name}] in ${row.route}`);
		return encodeURIComponent(String(params[name]));
	});
	return req.query ? `${path}?${req.query}` : path;
}

function send(client: Client, row: Row, req: Req, pid: number, page = false): Promise<Response> {
	const path = url(row, req, pid);
	if (req.form) return client.fetch(path, { method: row.method, body: req.form() });
	if (page) return client.fetch(path, { headers: { accept: 'text/html' } });
	if (req.body === undefined) return client.fetch(path, { method: row.method });
	return client.json(row.method, path, req.body);
}

describe('the table covers exactly the routes that exist', () => {
	const { endpoints, pages, actions } = discover();
	const key = (r: Row) => `${r.method} ${r.route}`;

	it('every +server.ts method has a line, and every line names a route that exists', () => {
		const table = ROUTES.map(key);
		expect(endpoints.size).toBeGreaterThan(30);
		expect(
			table.filter((k) => !endpoints.has(k)),
			'lines for routes that no longer exist'
		).toEqual([]);
		expect(
			[...endpoints].filter((k) => !table.includes(k)),
			'routes with no line in authz.table.ts'
		).toEqual([]);
		expect(new Set(table).size).toBe(table.length);
	});

	it('every form action has a line with its least role, and every line names an action that exists', () => {
		const table = ACTIONS.map((a) => `POST ${a.page}?/${a.name}`);
		expect(actions.size).toBeGreaterThan(30);
		expect(
			table.filter((k) => !actions.has(k)),
			'lines for actions that no longer exist'
		).toEqual([]);
		expect(
			[...actions].filter((k) => !table.includes(k)),
			'form actions with no line in authz.table.ts ACTIONS'
		).toEqual([]);
		expect(new Set(table).size).toBe(table.length);
	});

	it('every page has a line, and every line names a page that exists', () => {
		const table = PAGES.map(key);
		expect(table.filter((k) => !pages.has(k))).toEqual([]);
		expect([...pages].filter((k) => !table.includes(k))).toEqual([]);
	});
});

describe('the matrix: each route × caller answers the expected status', () => {
	it.each(ROUTES.map((r) => [`${r.method} ${r.route}`, r] as const))('%s', async (_, row) => {
		const got: Record<string, number> = {};
		const want: Record<string, number> = {};
		for (const [i, caller] of CALLERS.entries()) {
			const req = await row.build(ctx);
			const before = fingerprint(server.db(), req.params?.pid !== undefined ? Number(req.params.pid) : ctx.pid);
			const res = await send(as[caller], row, req, Number(req.params?.pid ?? ctx.pid));
			got[caller] = res.status;
			want[caller] = row.expect[i];
			if (res.status >= 400) {
				const body = await res.json();
				// the contract's error shape on every refusal
				expect(body.error, `${caller}: ${JSON.stringify(body)}`).toEqual(
					expect.objectContaining({ code: expect.any(String), message: expect.any(String) })
				);
				// a refusal wrote nothing
				expect(
					fingerprint(server.db(), Number(req.params?.pid ?? ctx.pid)),
					`${caller} refused but the project changed`
				).toBe(before);
			} else await res.arrayBuffer();
		}
		expect(got).toEqual(want);
	});

	it.each(PAGES.map((r) => [`${r.method} ${r.route}`, r] as const))('page %s', async (_, row) => {
		const got: Record<string, number> = {};
		const want: Record<string, number> = {};
		for (const [i, caller] of CALLERS.entries()) {
			const req = await row.build(ctx);
			const res = await send(as[caller], row, req, ctx.pid, true);
			got[caller] = res.status;
			want[caller] = row.expect[i];
			const html = await res.text();
			// a refused page shows no project data (its name is the first thing a leak would show)
			if (res.status !== 200 && row.route.startsWith('/projects/')) expect(html).not.toContain('Test project');
		}
		expect(got).toEqual(want);
	});

	it('a page’s data endpoint (__data.json, used on client-side navigation) refuses the same callers', async () => {
		for (const caller of ['outsider', 'anonymous', 'review'] as const) {
			const res = await as[caller].get(`/projects/${ctx.pid}/__data.json`);
			const text = await res.text();
			expect(text, caller).not.toMatch(/Test project/);
			expect(text).toMatch(/"type":"(error|redirect)"/);
		}
		const member = await as.viewer.get(`/projects/${ctx.pid}/__data.json`);
		expect(await member.text()).toMatch(/Test project/);
	});
});

/** Posts an empty form to a named action the way `use:enhance` does, and reads the status SvelteKit decided. */
async function runAction(client: Client, a: ActionRow): Promise<number> {
	const params: Record<string, string | number> = { id: ctx.pid, token: reviewToken, ...a.params };
	const path = a.page.replace(/\[(\w+)\]/g, (_, name: string) => encodeURIComponent(String(params[name])));
	const res = await client.fetch(a.name === 'default' ? path : `${path}?/${a.name}`, {
		method: 'POST',
		headers: { accept: 'application/json', 'x-sveltekit-action': 'true' },
		body: new FormData()
	});
	const text = await res.text();
	try {
		const body = JSON.parse(text) as { type?: string; status?: number };
		// failure, success and redirect travel as 200 with their own status; a thrown error() is the HTTP status
		return body.type && body.type !== 'error' && body.status ? body.status : res.status;
	} catch {
		return res.status;
	}
}

describe('the form-action matrix: each action × caller is refused below its least role', () => {
	it.each(ACTIONS.map((a) => [`${a.page}?/${a.name} (${a.min})`, a] as const))('%s', async (_, a) => {
		const got: Record<string, number> = {};
		const want: Record<string, number> = {};
		for (const [i, caller] of CALLERS.entries()) {
			const before = fingerprint(server.db(), ctx.pid);
			got[caller] = await runAction(as[caller], a);
			want[caller] = actionExpect(a)[i];
			if ([401, 403, 404].includes(got[caller]) && a.allowed < 401)
				expect(fingerprint(server.db(), ctx.pid), `${caller} refused but the project changed`).toBe(before);
		}
		expect(got).toEqual(want);
		if (a.signsOut) await signInAgain();
	});
});

describe('foreign ids answer 404 and change nothing', () => {
	// row ids only: a revision number [n] names this project's own revision, a [token] or [sheet] no row at all
	const withIds = ROUTES.filter(
		(r) => r.route.startsWith('/api/projects/[pid]/') && /\[(id|userId|photoId)\]/.test(r.route)
	);

	it.each(withIds.map((r) => [`${r.method} ${r.route}`, r] as const))(
		'%s with another project’s ids, as this project’s owner',
		async (_, row) => {
			// ids made in the foreign project, sent under our own project id
			const req = await row.build(foreign);
			const before = fingerprint(server.db(), foreign.pid);
			const res = await send(as.owner, row, req, ctx.pid);
			expect(res.status).toBe(404);
			expect((await res.json()).error.code).toBe('not-found');
			expect(fingerprint(server.db(), foreign.pid)).toBe(before);
		}
	);

	it('a programmer of project A hitting project B’s universe and fixture ids under B → 404, B unchanged', async () => {
		const u = await foreign.universe();
		const f = await foreign.fixture('dmx');
		const before = fingerprint(server.db(), foreign.pid);
		for (const [method, path, body] of [
			['GET', `/api/projects/${foreign.pid}/universes/${u.id}`],
			['PATCH', `/api/projects/${foreign.pid}/universes/${u.id}`, { name: 'taken', version: 1 }],
			['GET', `/api/projects/${foreign.pid}/fixtures/${f.id}`],
			['PATCH', `/api/projects/${foreign.pid}/fixtures/${f.id}`, { label: 'taken', version: 1 }],
			['DELETE', `/api/projects/${foreign.pid}/fixtures/${f.id}`]
		] as const) {
			const res = await as.programmer.json(method, path, body);
			expect(res.status, `${method} ${path}`).toBe(404);
			// never reveal the project exists: same answer as for a project id nobody has
			expect((await res.json()).error.message).toBe('No such project.');
		}
		expect(fingerprint(server.db(), foreign.pid)).toBe(before);
	});
});

describe('privileged fields sent by lower roles are refused', () => {
	const privileged: Record<string, (c: Ctx) => unknown> = {
		label: () => 'RENAMED',
		number: (c) => 90000 + c.seq(),
		control: (c) => ({ kind: 'dmx', universeId: c.base.universeId, address: 400 }),
		typeId: (c) => c.base.typeId,
		modeId: (c) => c.base.modeId,
		position: () => 'elsewhere',
		group: () => 'other',
		linkGroup: () => 'L9',
		colour: () => 'red',
		watts: () => 90,
		look: () => ({ hue: 120 })
	};

	it.each(Object.keys(privileged))(
		'electrician PATCH of a fixture’s %s → 403, row unchanged (single and bulk)',
		async (field) => {
			const f = await ctx.fixture('dmx');
			const before = fingerprint(server.db(), ctx.pid);
			const single = await as.electrician.patch(`/api/projects/${ctx.pid}/fixtures/${f.id}`, {
				[field]: privileged[field](ctx),
				version: 1
			});
			expect(single.status).toBe(403);
			expect((await single.json()).error.code).toBe('forbidden');
			// mixed with allowed fields, still refused as a whole
			const bulk = await as.electrician.patch(`/api/projects/${ctx.pid}/fixtures`, {
				fixtures: [{ id: f.id, state: 'hung', [field]: privileged[field](ctx), version: 1 }]
			});
			expect(bulk.status).toBe(403);
			expect(fingerprint(server.db(), ctx.pid)).toBe(before);
			// the programmer may change the same field
			const ok = await as.programmer.patch(`/api/projects/${ctx.pid}/fixtures/${f.id}`, {
				[field]: privileged[field](ctx),
				version: 1
			});
			expect(ok.status).toBe(200);
		}
	);

	it('electrician PATCH of state and notes → 200 and stored; viewer → 403', async () => {
		const f = await ctx.fixture('dmx');
		const ok = await as.electrician.patch(`/api/projects/${ctx.pid}/fixtures/${f.id}`, {
			state: 'addressed',
			notes: 'tape says 1',
			version: 1
		});
		expect(ok.status).toBe(200);
		const got = await (await as.viewer.get(`/api/projects/${ctx.pid}/fixtures/${f.id}`)).json();
		expect(got).toMatchObject({ state: 'addressed', notes: 'tape says 1', version: 2, control: { kind: 'dmx' } });
		const viewer = await as.viewer.patch(`/api/projects/${ctx.pid}/fixtures/${f.id}`, { state: 'fault', version: 2 });
		expect(viewer.status).toBe(403);
	});

	it('a programmer cannot manage members or delete the project (owner only)', async () => {
		const m = await ctx.member();
		const before = fingerprint(server.db(), ctx.pid);
		expect((await as.programmer.patch(`/api/projects/${ctx.pid}/members/${m.userId}`, { role: 'owner' })).status).toBe(
			403
		);
		expect((await as.programmer.delete(`/api/projects/${ctx.pid}`)).status).toBe(403);
		expect(fingerprint(server.db(), ctx.pid)).toBe(before);
	});
});
