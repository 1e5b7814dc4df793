import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, PASSWORD } from '../helpers/factories';
import { fingerprint } from '../helpers/fingerprint';
import { startServer, type Client, type TestServer } from '../helpers/server';
import { makeCtx, ROUTES, type Ctx, type Row } from './authz.table';

// Property tests over every JSON write route's body (brief: "bad input gets a clear error
// and writes nothing"): starting from a body that is valid for the route (authz.table.ts),
// fast-check swaps any part for junk — wrong types, out-of-range numbers, huge strings,
// unicode, nested junk, prototype-pollution keys — or sends junk outright. For every
// answer: never a 5xx; every non-2xx is { error: { code, message } }; a refused call
// leaves the project's rows byte-for-byte as they were.

const RUNS = Number(process.env.FUZZ_RUNS ?? 60);
export const runCounts: Record<string, number> = {};

let server: TestServer;
let ctx: Ctx;
let owner: Client;
let electrician: Client;
let reviewToken: string;

beforeAll(async () => {
	server = await startServer();
	const { project, crew } = await makeCrew(server.db());
	owner = await server.signIn(crew.owner.email, PASSWORD);
	electrician = await server.signIn(crew.electrician.email, PASSWORD);
	ctx = await makeCtx(server.db(), project.id, owner, crew);
	// a revision and a live review link, so the token routes are fuzzed past the token check
	await owner.post(`/api/projects/${project.id}/revisions`, { note: 'fuzz baseline' });
	const link = (await (await owner.post(`/api/projects/${project.id}/review-links`, { revision: 1 })).json()) as {
		url: string;
	};
	reviewToken = new URL(link.url).pathname.split('/').pop()!;
}, 60_000);
afterAll(() => server?.stop());

const POLLUTERS = ['__proto__', 'constructor', 'prototype'] as const;

/** Sets an OWN property, so `__proto__` survives into JSON.stringify as a key. */
function setOwn(target: Record<string, unknown>, key: string, value: unknown) {
	// an array's `length` cannot be redefined: leave that one as it is
	if (Array.isArray(target) && key === 'length') return;
	Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true });
}

type Path = (string | number)[];
function paths(value: unknown, at: Path = []): Path[] {
	if (value === null || typeof value !== 'object') return [at];
	const here: Path[] = [at];
	for (const [k, v] of Object.entries(value)) here.push(...paths(v, [...at, Array.isArray(value) ? Number(k) : k]));
	return here;
}

const isObject = (v: unknown) => v !== null && typeof v === 'object';
const getAt = (root: unknown, path: Path) =>
	path.reduce<unknown>((node, p) => (node as Record<string, unknown>)[p], root);

function setAt(root: unknown, path: Path, value: unknown): unknown {
	if (path.length === 0) return value;
	const copy = structuredClone(root) as Record<string, unknown>;
	let node = copy;
	for (const p of path.slice(0, -1)) node = node[p] as Record<string, unknown>;
	setOwn(node, String(path[path.length - 1]), value);
	return copy;
}

const unicode = fc.string({ unit: 'grapheme', maxLength: 80 });
const huge = fc.constantFrom(
	'x'.repeat(6000),
	'€'.repeat(70_000),
	'y'.repeat(1024 * 1024 + 1),
	'\u0000'.repeat(100),
	'\uD800',
	'𝕏'.repeat(3000)
);
const number = fc.oneof(
	fc.integer(),
	fc.double(),
	fc.constantFrom(0, -1, 0.5, 512, 513, 63999, 64000, 2 ** 31, 2 ** 53 + 1, -(2 ** 63), 1e308, -0)
);
const junkObject = fc.oneof(
	fc.constantFrom(...POLLUTERS).map((k) => {
		const o = {};
		setOwn(o, k, { polluted: 'fuzz-polluted', prototype: { polluted: 'fuzz-polluted' } });
		return o;
	}),
	fc.dictionary(fc.oneof(unicode, fc.constantFrom(...POLLUTERS)), fc.anything({ maxDepth: 2 }), { maxKeys: 4 })
);
const junk: fc.Arbitrary<unknown> = fc.oneof(
	fc.anything({ maxDepth: 3, withBigInt: false }),
	unicode,
	huge,
	number,
	fc.boolean(),
	fc.constant(null),
	junkObject,
	fc.array(fc.anything({ maxDepth: 2 }), { maxLength: 6 }),
	// deep nesting
	fc.integer({ min: 50, max: 3000 }).map((d) => JSON.parse('['.repeat(d) + ']'.repeat(d)) as unknown)
);

/** A body (or a raw string) derived from `valid`: one part replaced, a key added, or junk outright. */
function bodies(valid: unknown): fc.Arbitrary<{ raw?: string; body?: unknown }> {
	const ps = paths(valid);
	return fc.oneof(
		{ weight: 5, arbitrary: fc.tuple(fc.constantFrom(...ps), junk).map(([p, j]) => ({ body: setAt(valid, p, j) })) },
		{
			weight: 2,
			arbitrary: fc
				.tuple(
					fc.constantFrom(...ps.filter((p) => isObject(getAt(valid, p)))),
					fc.oneof(fc.constantFrom(...POLLUTERS), unicode),
					junk
				)
				.map(([p, k, j]) => ({ body: setAt(valid, [...p, k], j) }))
		},
		{ weight: 1, arbitrary: junk.map((j) => ({ body: j })) },
		{
			weight: 1,
			arbitrary: fc
				.oneof(unicode, fc.constantFrom('{', '{"a":}', '[1,2', 'null', '"\\ud800"', '{"__proto__":'))
				.map((raw) => ({ raw }))
		}
	);
}

async function check(client: Client, row: Row, path: string, sent: { raw?: string; body?: unknown }) {
	const before = fingerprint(server.db(), ctx.pid);
	const text = sent.raw ?? JSON.stringify(sent.body) ?? 'null';
	const res = await client.fetch(path, {
		method: row.method,
		headers: { 'content-type': 'application/json' },
		body: text
	});
	const answer = await res.text();
	expect(res.status, `${row.method} ${path} ${text.slice(0, 300)} → ${answer.slice(0, 300)}`).toBeLessThan(500);
	if (res.status >= 300) {
		const body = JSON.parse(answer) as { error?: { code?: unknown; message?: unknown } };
		expect(typeof body.error?.code, answer).toBe('string');
		expect(typeof body.error?.message, answer).toBe('string');
		expect(fingerprint(server.db(), ctx.pid), `${res.status} for ${text.slice(0, 200)} but the project changed`).toBe(
			before
		);
	}
	return res.status;
}

// the /api catch-all takes no body: it answers 404 to anything
const writes = ROUTES.filter((r) => r.method !== 'GET' && r.method !== 'DELETE' && !r.route.includes('[...rest]'));
const targets: [string, Row, 'owner' | 'electrician'][] = [
	...writes.map((r) => [`${r.method} ${r.route} (owner)`, r, 'owner'] as [string, Row, 'owner']),
	...writes
		.filter((r) => r.route.includes('/fixtures') && r.method === 'PATCH')
		.map((r) => [`${r.method} ${r.route} (electrician)`, r, 'electrician'] as [string, Row, 'electrician'])
];

describe('fuzzed bodies never crash the server and refusals write nothing', () => {
	it.each(targets)(
		'%s',
		async (name, row, who) => {
			const req = await row.build(ctx);
			if (req.form) {
				// multipart: random bytes as the "photo" must be refused as a type, never crash
				const formParams: Record<string, string | number> = { pid: ctx.pid, ...req.params };
				const path = row.route.replace(/\[(\w+)\]/g, (_, n: string) => String(formParams[n]));
				await fc.assert(
					fc.asyncProperty(
						fc.uint8Array({ maxLength: 4096 }),
						fc.oneof(unicode, fc.constant('__proto__')),
						async (bytes, field) => {
							const before = fingerprint(server.db(), ctx.pid);
							const form = new FormData();
							form.set(field, new Blob([bytes]), 'x.bin');
							const res = await owner.fetch(path, { method: 'POST', body: form });
							const body = await res.json();
							expect(res.status).toBeLessThan(500);
							if (res.status >= 300) {
								expect(body.error).toEqual(
									expect.objectContaining({ code: expect.any(String), message: expect.any(String) })
								);
								expect(fingerprint(server.db(), ctx.pid)).toBe(before);
							}
						}
					),
					{ numRuns: RUNS }
				);
				runCounts[name] = RUNS;
				return;
			}
			const params: Record<string, string | number> = { pid: ctx.pid, token: reviewToken, ...req.params };
			const path = row.route.replace(/\[(\w+)\]/g, (_, n: string) => String(params[n]));
			const client = who === 'owner' ? owner : electrician;
			const statuses = new Map<number, number>();
			await fc.assert(
				fc.asyncProperty(bodies(req.body), async (sent) => {
					const status = await check(client, row, path, sent);
					statuses.set(status, (statuses.get(status) ?? 0) + 1);
				}),
				{ numRuns: RUNS }
			);
			runCounts[name] = RUNS;
			// most mutations must be refused as bad input (400), not slip through
			// (422: an import whose rows are refused, DESIGN "Imports")
			const refused = [400, 403, 413, 422].reduce((n, s) => n + (statuses.get(s) ?? 0), 0);
			expect(refused, `statuses: ${JSON.stringify([...statuses])}`).toBeGreaterThan(RUNS / 3);
		},
		120_000
	); // each run dumps the project for its before/after check; slow on a busy two-core machine
});

describe('prototype pollution', () => {
	it('__proto__ / constructor.prototype payloads to every write route leave Object.prototype clean in the server', async () => {
		const payloads = [
			'{"__proto__":{"polluted":"yes-polluted"}}',
			'{"constructor":{"prototype":{"polluted":"yes-polluted"}}}',
			'[{"__proto__":{"polluted":"yes-polluted"}}]'
		];
		for (const row of writes) {
			const req = await row.build(ctx);
			if (req.form) continue;
			const params: Record<string, string | number> = { pid: ctx.pid, token: reviewToken, ...req.params };
			const path = row.route.replace(/\[(\w+)\]/g, (_, n: string) => String(params[n]));
			const valid = JSON.stringify(req.body);
			// also merged into an otherwise valid body, at the top and one level down
			const merged = [
				valid.replace(/^\{/, '{"__proto__":{"polluted":"yes-polluted"},'),
				valid.replace(/\{"kind"/, '{"__proto__":{"polluted":"yes-polluted"},"kind"')
			];
			for (const text of [...payloads, ...merged]) {
				const res = await owner.fetch(path, {
					method: row.method,
					headers: { 'content-type': 'application/json' },
					body: text
				});
				expect(res.status, `${row.method} ${row.route} ${text}`).toBeLessThan(500);
				await res.arrayBuffer();
			}
		}
		// a polluted Object.prototype would show through `for…in` / `in` checks: a strict schema would
		// report the inherited key, a plain object would carry it into JSON built by spreading
		const unknown = await owner.post('/api/projects', { name: 'after pollution', zzz: 1 });
		const unknownText = await unknown.text();
		expect(unknown.status).toBe(400);
		expect(unknownText).not.toContain('polluted');
		const created = await owner.post('/api/projects', { name: 'after pollution' });
		expect(created.status).toBe(201);
		for (const path of [
			`/api/projects/${ctx.pid}/patch`,
			`/api/projects/${ctx.pid}/fixtures`,
			'/api/projects',
			`/api/projects/${ctx.pid}/types`
		]) {
			const text = await (await owner.get(path)).text();
			expect(text, path).not.toContain('polluted');
		}
		// nor did any stored row keep the key
		const stored = JSON.stringify(
			server.db().$client.prepare('select * from audit_log where project_id = ?').all(ctx.pid)
		);
		expect(stored).not.toContain('yes-polluted');
	});
});
