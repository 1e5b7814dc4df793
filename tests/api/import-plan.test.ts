import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addMember, makeCrew, signInCrew } from '../helpers/factories';
import { startServer, type Client, type TestServer } from '../helpers/server';
import { auditLog, fixtures } from '../../src/lib/server/db/schema';

// A CSV apply that follows its preview writes the preview's checked plan (import/csv-plan.ts) only
// for the same bytes, project and user, and only while nothing was committed since; otherwise it runs
// every check again. These are the cases where a kept plan would be wrong.

let server: TestServer;
let as: Awaited<ReturnType<typeof signInCrew>>;
let crewIds: Record<'owner' | 'programmer', string>;

beforeAll(async () => {
	server = await startServer();
	const { crew, outsider } = await makeCrew(server.db());
	as = await signInCrew(server, crew, outsider);
	crewIds = { owner: crew.owner.id, programmer: crew.programmer.id };
});
afterAll(() => server?.stop());

const CSV = [
	'number,maker,model,mode,universe,address',
	'1,Acme Lamps,Deck Panel,Basic,1,1',
	'2,Acme Lamps,Deck Panel,Basic,1,5',
	'3,Acme Lamps,Deck Panel,Basic,2,1'
].join('\n');

function importTo(p: number, text: string, apply: boolean, client: Client = as.programmer): Promise<Response> {
	const form = new FormData();
	form.set('file', new Blob([text]), 'rig.csv');
	return client.fetch(`/api/projects/${p}/import${apply ? '?apply=true' : ''}`, { method: 'POST', body: form });
}

/** A project of the crew (the owner creates it and adds the programmer) with the Deck Panel type. */
async function project(
	name: string
): Promise<{ pid: number; type: { id: number; version: number; modes: { id: number }[] } }> {
	const pid = (await (await as.owner.post('/api/projects', { name })).json()).id as number;
	addMember(server.db(), pid, crewIds.programmer, 'programmer');
	const res = await as.programmer.post(`/api/projects/${pid}/types`, {
		maker: 'Acme Lamps',
		model: 'Deck Panel',
		modes: [
			{
				name: 'Basic',
				channels: [
					{ offset: 1, parameter: 'intensity', bits: 8 },
					{ offset: 2, parameter: 'cct', bits: 8 }
				]
			}
		]
	});
	expect(res.status).toBe(201);
	return { pid, type: await res.json() };
}

const numbers = (p: number) =>
	server
		.db()
		.select({ number: fixtures.number })
		.from(fixtures)
		.where(eq(fixtures.projectId, p))
		.all()
		.map((f) => f.number)
		.sort((a, b) => a - b);

describe('CSV apply after its preview', () => {
	it('a write between preview and apply makes apply check the file again, and refuse it when it no longer fits', async () => {
		const { pid, type } = await project('Plan: renamed type');
		const preview = await importTo(pid, CSV, false);
		expect(preview.status).toBe(200);
		expect((await preview.json()).create).toHaveLength(3);
		// the file names the type by maker and model: after the rename it names no type of this project
		const renamed = await as.programmer.patch(`/api/projects/${pid}/types/${type.id}`, {
			version: type.version,
			model: 'Dock Panel'
		});
		expect(renamed.status).toBe(200);
		const applied = await importTo(pid, CSV, true);
		expect(applied.status).toBe(422);
		const issues = (await applied.json()).error.issues as { row: number; message: string }[];
		expect(issues.map((i) => i.row)).toEqual([2, 3, 4]);
		expect(issues[0].message).toMatch(/No fixture type "Acme Lamps Deck Panel"/);
		expect(numbers(pid)).toEqual([]);
	});

	it('a write that still lets the file fit: apply writes it and its conflicts are those after that write', async () => {
		const { pid, type } = await project('Plan: fixture added');
		const preview = await (await importTo(pid, CSV, false)).json();
		expect(preview.conflicts).toEqual([]);
		// fixture 9 at universe 1 address 2 overlaps the file's fixture 1 on slot 2 (Basic takes two slots)
		const universe = (await (await as.programmer.post(`/api/projects/${pid}/universes`, { number: 1 })).json()).id;
		const added = await as.programmer.post(`/api/projects/${pid}/fixtures`, {
			number: 9,
			typeId: type.id,
			modeId: type.modes[0].id,
			control: { kind: 'dmx', universeId: universe, address: 2 }
		});
		expect(added.status).toBe(201);
		const res = await importTo(pid, CSV, true);
		expect(res.status).toBe(201);
		const applied = await res.json();
		expect(applied.create).toEqual(preview.create);
		expect(applied.universes).toEqual([{ number: 2, name: 'Universe 2', action: 'create' }]);
		expect(applied.conflicts.map((c: { message: string }) => c.message)).toEqual([
			expect.stringMatching(/^Fixtures (1 and 9|9 and 1) both claim slot 2 of universe 1\b/)
		]);
		expect(numbers(pid)).toEqual([1, 2, 3, 9]);
	});

	it("another project's preview of the same file is never applied", async () => {
		const a = await project('Plan: previewed here');
		// b has no Deck Panel type: the file does not fit it
		const b = (await (await as.programmer.post('/api/projects', { name: 'Plan: applied there' })).json()).id as number;
		// nothing is committed between the preview and the apply; only the project differs
		expect((await importTo(a.pid, CSV, false)).status).toBe(200);
		const applied = await importTo(b, CSV, true);
		expect(applied.status).toBe(422);
		const issues = (await applied.json()).error.issues as { row: number; message: string }[];
		expect(issues.map((i) => i.row)).toEqual([2, 3, 4]);
		expect(issues[0].message).toMatch(/No fixture type "Acme Lamps Deck Panel"/);
		expect(numbers(a.pid)).toEqual([]);
		expect(numbers(b)).toEqual([]);
	});

	it("another user's preview is not theirs to apply: the apply runs as its own user", async () => {
		const { pid } = await project('Plan: two users');
		expect((await importTo(pid, CSV, false, as.programmer)).status).toBe(200);
		const res = await importTo(pid, CSV, true, as.owner);
		expect(res.status).toBe(201);
		expect(numbers(pid)).toEqual([1, 2, 3]);
		const entry = server
			.db()
			.select()
			.from(auditLog)
			.where(and(eq(auditLog.projectId, pid), eq(auditLog.action, 'fixture.import')))
			.all();
		expect(entry.map((e) => e.userId)).toEqual([crewIds.owner]);
		// the programmer's own plan is stale now: their apply checks the file again and finds nothing to do
		const again = await importTo(pid, CSV, true, as.programmer);
		expect(again.status).toBe(201);
		expect(await again.json()).toMatchObject({ universes: [], create: [], update: [] });
		expect(numbers(pid)).toEqual([1, 2, 3]);
	});
});
