import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, PASSWORD } from '../helpers/factories';
import { startServer, type Client, type TestServer } from '../helpers/server';
import { eq } from 'drizzle-orm';
import { fixtures } from '../../src/lib/server/db/schema';
import { makeCtx } from './authz.table';

// Optimistic concurrency (DESIGN.md "PATCH takes … the version it read"): of N writers
// holding the same version, exactly one wins and nobody's change is silently overwritten.

const N = 20;
let server: TestServer;
let programmers: Client[];
let pid: number;
let universeId: number;
let fixtureId: number;

beforeAll(async () => {
	server = await startServer();
	const { project, crew } = await makeCrew(server.db());
	pid = project.id;
	const owner = await server.signIn(crew.owner.email, PASSWORD);
	const ctx = await makeCtx(server.db(), pid, owner, crew);
	universeId = ctx.base.universeId;
	fixtureId = (await ctx.fixture('dmx')).id;
	// two sessions and N requests in flight at once; the version check does not care who sends them
	const one = await server.signIn(crew.programmer.email, PASSWORD);
	programmers = Array.from({ length: N }, () => one);
	programmers[0] = owner;
}, 60_000);
afterAll(() => server?.stop());

describe('no lost update', () => {
	it(`${N} concurrent PATCHes with the same version: exactly one 200, the rest 409 with the winner as current`, async () => {
		const start = (await (await programmers[1].get(`/api/projects/${pid}/fixtures/${fixtureId}`)).json())
			.version as number;
		const results = await Promise.all(
			programmers.map(async (client, i) => {
				const body = {
					label: `WRITER ${i}`,
					control: { kind: 'dmx', universeId, address: 10 + i * 20 },
					version: start
				};
				const res = await client.patch(`/api/projects/${pid}/fixtures/${fixtureId}`, body);
				return { i, status: res.status, body: await res.json() };
			})
		);
		const won = results.filter((r) => r.status === 200);
		const lost = results.filter((r) => r.status !== 200);
		expect(won).toHaveLength(1);
		expect(lost.map((r) => r.status)).toEqual(Array(N - 1).fill(409));
		const w = won[0].i;
		for (const l of lost) {
			expect(l.body.error.code).toBe('stale');
			expect(l.body.current).toMatchObject({ label: `WRITER ${w}`, version: start + 1 });
		}
		// the stored row is the winner's, in the database and through the API
		const row = server.db().select().from(fixtures).where(eq(fixtures.id, fixtureId)).get()!;
		expect(row).toMatchObject({ label: `WRITER ${w}`, address: 10 + w * 20, universeId, version: start + 1 });
		const got = await (await programmers[1].get(`/api/projects/${pid}/fixtures/${fixtureId}`)).json();
		expect(got).toMatchObject({
			label: `WRITER ${w}`,
			control: { kind: 'dmx', universeId, address: 10 + w * 20 },
			version: start + 1
		});
	});

	it(`${N} concurrent bulk PATCHes naming the same fixture: one batch wins whole, the others write nothing`, async () => {
		const a = (await (await programmers[1].get(`/api/projects/${pid}/fixtures/${fixtureId}`)).json()).version as number;
		const results = await Promise.all(
			programmers.map(async (client, i) => {
				const res = await client.patch(`/api/projects/${pid}/fixtures`, {
					fixtures: [{ id: fixtureId, notes: `batch ${i}`, version: a }]
				});
				return { i, status: res.status };
			})
		);
		const won = results.filter((r) => r.status === 200);
		expect(won).toHaveLength(1);
		expect(results.filter((r) => r.status === 409)).toHaveLength(N - 1);
		const row = server.db().select().from(fixtures).where(eq(fixtures.id, fixtureId)).get()!;
		expect(row).toMatchObject({ notes: `batch ${won[0].i}`, version: a + 1 });
	});
});
