import { request } from 'node:http';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { startServer, type Client, type TestServer } from '../helpers/server';
import type { PatchData } from '../../src/lib/shapes';

// Compression and the versioned JSON of issue 14 (RFC 9110 §8.4 content codings, §13.1.2
// If-None-Match; RFC 7932 brotli, RFC 1952 gzip). Node's fetch would undo the coding for us, so
// these requests go through node:http and see the bytes on the wire.

let server: TestServer;
let pid: number;
let owner: Client;

interface Raw {
	status: number;
	headers: Record<string, string | string[] | undefined>;
	body: Buffer;
}

function raw(path: string, headers: Record<string, string> = {}, client?: Client): Promise<Raw> {
	const cookie = client ? [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ') : '';
	return new Promise((resolve, reject) => {
		const req = request(`${server.url}${path}`, { headers: { ...headers, ...(cookie ? { cookie } : {}) } }, (res) => {
			const chunks: Buffer[] = [];
			res.on('data', (c: Buffer) => chunks.push(c));
			res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
			res.on('error', reject);
		});
		req.on('error', reject);
		req.end();
	});
}

function decoded(r: Raw): string {
	const coding = r.headers['content-encoding'];
	if (coding === 'br') return brotliDecompressSync(r.body).toString('utf8');
	if (coding === 'gzip') return gunzipSync(r.body).toString('utf8');
	return r.body.toString('utf8');
}

beforeAll(async () => {
	server = await startServer({ demo: true });
	pid = demoProjectId(server.db());
	owner = await server.signIn('owner@demo.test');
});
afterAll(() => server?.stop());

describe('compression', () => {
	it('sends the patch as br or gzip when asked, the same JSON once decoded, and plain when not asked', async () => {
		const plain = await raw(`/api/projects/${pid}/patch`, {}, owner);
		expect(plain.status).toBe(200);
		expect(plain.headers['content-encoding']).toBeUndefined();
		expect(plain.headers.vary).toMatch(/accept-encoding/i);
		const text = plain.body.toString('utf8');
		expect((JSON.parse(text) as PatchData).fixtures.length).toBeGreaterThan(0);

		const br = await raw(`/api/projects/${pid}/patch`, { 'accept-encoding': 'gzip, deflate, br' }, owner);
		expect(br.headers['content-encoding']).toBe('br');
		expect(decoded(br)).toBe(text);
		expect(br.body.byteLength).toBeLessThan(plain.body.byteLength / 3);
		expect(Number(br.headers['content-length'])).toBe(br.body.byteLength);

		// br refused with q=0: gzip
		const gz = await raw(`/api/projects/${pid}/patch`, { 'accept-encoding': 'br;q=0, gzip' }, owner);
		expect(gz.headers['content-encoding']).toBe('gzip');
		expect(decoded(gz)).toBe(text);
		// nothing we make: identity
		const none = await raw(`/api/projects/${pid}/patch`, { 'accept-encoding': 'deflate' }, owner);
		expect(none.headers['content-encoding']).toBeUndefined();
		expect(none.body.toString('utf8')).toBe(text);
	});

	it('leaves small answers, live updates and the precompressed static files alone', async () => {
		const health = await raw('/api/health', { 'accept-encoding': 'br' });
		expect(health.status).toBe(200);
		expect(health.body.byteLength).toBeLessThan(1024);
		expect(health.headers['content-encoding']).toBeUndefined();

		const page = await raw(`/projects/${pid}/patch`, { 'accept-encoding': 'gzip', accept: 'text/html' }, owner);
		expect(page.status).toBe(200);
		expect(page.headers['content-encoding']).toBe('gzip');
		const html = decoded(page);
		expect(html).toMatch(/^<!doctype html>/i);
		// the page's own ETag, sent back in its gzip form, still earns SvelteKit's 304
		expect(page.headers.etag).toMatch(/-gz"$/);
		const again = await raw(
			`/projects/${pid}/patch`,
			{ 'accept-encoding': 'gzip', accept: 'text/html', 'if-none-match': page.headers.etag as string },
			owner
		);
		expect(again.status).toBe(304);

		// a script the page loads: adapter-node's own .br file, compressed once (it decodes to JavaScript)
		const script = /\/_app\/immutable\/[^"]+\.js/.exec(html)?.[0];
		expect(script).toBeDefined();
		const asset = await raw(script!, { 'accept-encoding': 'br' });
		expect(asset.headers['content-encoding']).toBe('br');
		expect(decoded(asset)).toMatch(/\b(import|export|function)\b/);

		// server-sent events must flow as they happen: never buffered into a compressor
		const events = await new Promise<Record<string, string | string[] | undefined>>((resolve, reject) => {
			const cookie = [...owner.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
			const req = request(
				`${server.url}/api/projects/${pid}/events`,
				{ headers: { cookie, 'accept-encoding': 'br, gzip', accept: 'text/event-stream' } },
				(res) => {
					resolve(res.headers);
					req.destroy();
				}
			);
			req.on('error', (err) => (req.destroyed ? undefined : reject(err)));
			req.end();
		});
		expect(events['content-type']).toMatch(/^text\/event-stream/);
		expect(events['content-encoding']).toBeUndefined();
	});
});

describe('versioned JSON (ETag per write)', () => {
	it('a write is visible at once, through the cache and the compressed copy, and an old tag gets the new body', async () => {
		const first = await raw(`/api/projects/${pid}/patch`, { 'accept-encoding': 'br' }, owner);
		const tag = first.headers.etag as string;
		expect(tag).toMatch(/^"[^"]+-br"$/);
		const p = JSON.parse(decoded(first)) as PatchData;

		// the same version again: 304, no body, whichever coding the tag was sent in
		const same = await raw(`/api/projects/${pid}/patch`, { 'accept-encoding': 'br', 'if-none-match': tag }, owner);
		expect(same.status).toBe(304);
		expect(same.body.byteLength).toBe(0);
		const plainTag = tag.replace(/-br"$/, '"');
		expect((await raw(`/api/projects/${pid}/patch`, { 'if-none-match': plainTag }, owner)).status).toBe(304);

		const fixture = p.fixtures[0];
		const label = `${fixture.label} — moved`;
		const res = await owner.patch(`/api/projects/${pid}/fixtures/${fixture.id}`, { label, version: fixture.version });
		expect(res.status).toBe(200);

		const after = await raw(`/api/projects/${pid}/patch`, { 'accept-encoding': 'br', 'if-none-match': tag }, owner);
		expect(after.status).toBe(200);
		expect(after.headers.etag).not.toBe(tag);
		const next = JSON.parse(decoded(after)) as PatchData;
		expect(next.fixtures.find((f) => f.id === fixture.id)?.label).toBe(label);

		// a commit by another connection (a script, a second process) is seen at once too
		server.db().$client.prepare('update fixture set label = ? where id = ?').run('OUTSIDE WRITE', fixture.id);
		const outside = await raw(
			`/api/projects/${pid}/patch`,
			{ 'accept-encoding': 'br', 'if-none-match': after.headers.etag as string },
			owner
		);
		expect(outside.status).toBe(200);
		expect((JSON.parse(decoded(outside)) as PatchData).fixtures.find((f) => f.id === fixture.id)?.label).toBe(
			'OUTSIDE WRITE'
		);
		// …/patch and …/conflicts change at the same writes: each keeps its own compressed copy
		const patchGz = await raw(`/api/projects/${pid}/patch`, { 'accept-encoding': 'gzip' }, owner);
		expect(patchGz.headers['content-encoding']).toBe('gzip');
		const conflicts = await raw(`/api/projects/${pid}/conflicts`, { 'accept-encoding': 'gzip' }, owner);
		expect(conflicts.headers.etag).not.toBe(patchGz.headers.etag);
		// GET …/fixtures: the rows of …/patch without what the engine computed, the outside write included
		const rows = JSON.parse(
			decoded(await raw(`/api/projects/${pid}/fixtures`, { 'accept-encoding': 'br' }, owner))
		) as {
			fixtures: Record<string, unknown>[];
		};
		expect(rows.fixtures.find((f) => f.id === fixture.id)?.label).toBe('OUTSIDE WRITE');
		expect(rows.fixtures).toEqual(
			(JSON.parse(decoded(outside)) as PatchData).fixtures.map((f) => {
				const copy: Record<string, unknown> = { ...f };
				for (const computed of ['slots', 'footprint', 'breakSlots']) delete copy[computed];
				return copy;
			})
		);
		expect(JSON.parse(decoded(conflicts))).toEqual({
			conflicts: (JSON.parse(decoded(outside)) as PatchData).conflicts
		});
	});

	it('a held tag earns nothing without a session: 401 before any 304', async () => {
		const first = await raw(`/api/projects/${pid}/patch`, {}, owner);
		const anonymous = await raw(`/api/projects/${pid}/patch`, { 'if-none-match': first.headers.etag as string });
		expect(anonymous.status).toBe(401);
	});
});
