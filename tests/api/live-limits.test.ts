import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { startServer, type Client, type TestServer } from '../helpers/server';

// Issue 20: live feeds (server-sent events) are bounded per person and in all; extras answer 429
// with the error shape, and a closed feed frees its place.

let server: TestServer;
let pid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;
const open: AbortController[] = [];

beforeAll(async () => {
	// two feeds a person, three in all
	server = await startServer({ env: { PATCHWRIGHT_LIVE_PER_USER: '2', PATCHWRIGHT_LIVE_TOTAL: '3' } });
	const { project, crew, outsider } = await makeCrew(server.db());
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
});
afterAll(async () => {
	for (const c of open) c.abort();
	await server?.stop();
});

/** Opens a feed and reads its hello; answers the status, and the controller that closes it. */
async function feed(
	client: Client
): Promise<{ status: number; body?: { error: { code: string; message: string } }; close(): void }> {
	const controller = new AbortController();
	const res = await client.fetch(`/api/projects/${pid}/events`, { signal: controller.signal });
	if (res.status !== 200) return { status: res.status, body: await res.json(), close: () => {} };
	open.push(controller);
	const reader = res.body!.getReader();
	const first = new TextDecoder().decode((await reader.read()).value);
	expect(first).toContain('event: hello');
	return { status: 200, close: () => controller.abort() };
}

async function eventually(fn: () => Promise<boolean>): Promise<boolean> {
	for (let i = 0; i < 50; i++) {
		if (await fn()) return true;
		await new Promise((r) => setTimeout(r, 100));
	}
	return false;
}

describe('live feed bounds', () => {
	it('refuses a third feed for one person with 429 JSON; another person still gets one', async () => {
		const a = await feed(as.viewer);
		const b = await feed(as.viewer);
		expect([a.status, b.status]).toEqual([200, 200]);
		const extra = await feed(as.viewer);
		expect(extra.status).toBe(429);
		expect(extra.body!.error.code).toBe('rate-limited');
		expect(extra.body!.error.message).toContain('live pages open');
		// the one-shot counter read holds no place and is never refused
		expect((await as.viewer.get(`/api/projects/${pid}/events?once=1`)).status).toBe(200);
		expect((await feed(as.electrician)).status).toBe(200);
	});

	it('refuses past the total, whoever asks', async () => {
		const res = await feed(as.programmer);
		expect(res.status).toBe(429);
		expect(res.body!.error.message).toContain('as many as it takes');
	});

	it('a closed feed frees its place', async () => {
		for (const c of open.splice(0)) c.abort();
		expect(
			await eventually(async () => {
				const f = await feed(as.programmer);
				return f.status === 200;
			})
		).toBe(true);
	});
});
