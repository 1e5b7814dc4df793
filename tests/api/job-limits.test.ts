import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoProjectId } from '../helpers/revisions';
import { startServer, type TestServer } from '../helpers/server';

// Heavy jobs (imports, backup checks, printed sheets) share a small worker pool (workers/pool.ts).
// Before this limit one member could queue any number of them, and everyone else's imports and
// sheets waited behind — past their own time budget. Now one person has at most
// PATCHWRIGHT_JOBS_PER_OWNER jobs waiting or running; the next answers 429 at once and writes nothing.

let server: TestServer;
let pid: number;

beforeAll(async () => {
	// one job each and one thread, so three sheets asked for at once are sure to overlap
	server = await startServer({ demo: true, env: { PATCHWRIGHT_JOBS_PER_OWNER: '1', PATCHWRIGHT_WORKERS: '1' } });
	pid = demoProjectId(server.db());
});
afterAll(() => server?.stop());

describe('heavy jobs per person', () => {
	it('a second sheet while the first still prints is refused with 429; another person is not held up', async () => {
		const electrician = await server.signIn('electrician@demo.test');
		const viewer = await server.signIn('viewer@demo.test');
		const sheet = `/api/projects/${pid}/sheets/labels.pdf`;
		// sent together: which of the two the server takes first is not ours to know, only that one waits
		const [a, b, theirs] = await Promise.all([electrician.get(sheet), electrician.get(sheet), viewer.get(sheet)]);
		const [printed, refused] = a.status === 429 ? [b, a] : [a, b];
		expect([printed.status, refused.status]).toEqual([200, 429]);
		expect(printed.headers.get('content-type')).toBe('application/pdf');
		const body = (await refused.json()) as { error: { code: string; message: string } };
		expect(body.error.code).toBe('too-many-jobs');
		expect(body.error.message).toMatch(/in progress/);
		expect(theirs.status).toBe(200);
		// the count goes back down: once the first is done the same person prints again
		expect((await electrician.get(sheet)).status).toBe(200);
	});
});
