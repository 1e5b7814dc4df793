import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { channels, makeFixture, makeType, makeUniverse } from '../helpers/patch-factories';
import { startServer, type TestServer } from '../helpers/server';
import { fixtures } from '../../src/lib/server/db/schema';

// The patch table's bulk tools (POST /api/projects/:pid/fixtures/bulk): each action one
// transaction, all or nothing, numbers and labels as the programmer asked.

let server: TestServer;
let pid: number;
let otherPid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;
let uni: number;
let type: ReturnType<typeof makeType>;

beforeAll(async () => {
	server = await startServer();
	const db = server.db();
	const { project, crew, outsider } = await makeCrew(db);
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
	otherPid = (await makeCrew(db)).project.id;
	uni = makeUniverse(db, pid, 1).id;
	type = makeType(db, pid, { six: channels(6), eight: channels(8) });
});
afterAll(() => server?.stop());

const bulk = (body: unknown) => as.programmer.post(`/api/projects/${pid}/fixtures/bulk`, body);
const all = () => server.db().select().from(fixtures).where(eq(fixtures.projectId, pid)).all();
const add = (extra: Record<string, unknown>) =>
	bulk({ action: 'add', typeId: type.type.id, modeId: type.modeIds.six, ...extra });

describe('adding a run of fixtures', () => {
	it('adds 30 numbered 101–130, labelled DECK {n}, laid end to end from address 1', async () => {
		const res = await add({ count: 30, firstNumber: 101, labelPattern: 'DECK {n}', universeId: uni, address: 1 });
		expect(res.status).toBe(201);
		const { fixtures: made } = await res.json();
		expect(made.map((f: { number: number }) => f.number)).toEqual(Array.from({ length: 30 }, (_, i) => 101 + i));
		expect(made[0].label).toBe('DECK 101');
		expect(made[29].label).toBe('DECK 130');
		// 6-slot mode: 1, 7, 13 … (30 × 6 = 180 slots)
		expect(made[2].control).toEqual({ kind: 'dmx', universeId: uni, address: 13 });
		expect(made[29].control.address).toBe(1 + 29 * 6);
	});

	it('pads {i:02} and leaves the run unpatched without a universe', async () => {
		const res = await add({ count: 2, firstNumber: 301, labelPattern: 'CAR {i:02}' });
		expect(res.status).toBe(201);
		const { fixtures: made } = await res.json();
		expect(made.map((f: { label: string }) => f.label)).toEqual(['CAR 01', 'CAR 02']);
		expect(made[0].control).toEqual({ kind: 'manual' });
	});

	it('"3 from 505" says how many fit and where to start, and writes nothing', async () => {
		const before = all().length;
		const res = await add({ count: 3, firstNumber: 401, universeId: uni, address: 505 });
		expect(res.status).toBe(400);
		const { error } = await res.json();
		// 505…512 is 8 slots: one 6-slot footprint; all three need 18 slots, so 512 − 18 + 1 = 495 (ANSI E1.11: slots 1–512)
		expect(error.message).toContain('Only 1 of 3 fixtures of 6 slots each fits from 505');
		expect(error.message).toContain('start at 495 or lower');
		expect(error.issues[0].path).toEqual(['address']);
		expect(all().length).toBe(before);
	});

	it('one taken number refuses the whole run', async () => {
		const before = all().length;
		// 128 is one of the DECK run above
		const res = await add({ count: 5, firstNumber: 126, labelPattern: 'X {n}' });
		expect(res.status).toBe(409);
		expect(all().length).toBe(before);
	});
});

describe('changing a selection', () => {
	const idsOf = (from: number, to: number) =>
		all()
			.filter((f) => f.number >= from && f.number <= to)
			.map((f) => f.id);

	it('renumbers from 1001 in steps of 10, in number order', async () => {
		const ids = idsOf(101, 103);
		const res = await bulk({ action: 'renumber', ids, from: 1001, step: 10 });
		expect(res.status).toBe(200);
		const byId = new Map(all().map((f) => [f.id, f.number]));
		expect(ids.map((id) => byId.get(id))).toEqual([1001, 1011, 1021]);
	});

	it('a renumber onto a number outside the selection changes nothing', async () => {
		const ids = idsOf(104, 106);
		const res = await bulk({ action: 'renumber', ids, from: 1010, step: 1 }); // 1011 is taken
		expect(res.status).toBe(409);
		const byId = new Map(all().map((f) => [f.id, f.number]));
		expect(ids.map((id) => byId.get(id))).toEqual([104, 105, 106]);
	});

	it('relabels with a pattern and keeps the selection order', async () => {
		const ids = idsOf(104, 106);
		const res = await bulk({ action: 'relabel', ids, pattern: 'BOW {i} ({n})' });
		expect(res.status).toBe(200);
		expect(
			all()
				.filter((f) => ids.includes(f.id))
				.map((f) => f.label)
		).toEqual(['BOW 1 (104)', 'BOW 2 (105)', 'BOW 3 (106)']);
	});

	it('duplicates as unpatched, planned copies numbered after the highest', async () => {
		const ids = idsOf(104, 105);
		const top = Math.max(...all().map((f) => f.number));
		const res = await bulk({ action: 'duplicate', ids });
		expect(res.status).toBe(201);
		const { fixtures: copies } = await res.json();
		expect(copies.map((f: { number: number }) => f.number)).toEqual([top + 1, top + 2]);
		expect(copies[0]).toMatchObject({ label: 'BOW 1 (104)', control: { kind: 'manual' }, state: 'planned' });
	});

	it('sets the feed, state and mode of a selection together', async () => {
		const pack = await as.programmer.post(`/api/projects/${pid}/pack-types`, {
			name: 'Four-cell 10 Ah',
			chemistry: 'li-ion',
			cells: 4,
			ampHours: 10,
			maxCurrentA: 10
		});
		expect(pack.status).toBe(201);
		const packTypeId = (await pack.json()).id;
		const ids = idsOf(107, 109);
		const res = await bulk({
			action: 'set',
			ids,
			fields: { feed: { kind: 'battery', packTypeId }, state: 'hung', modeId: type.modeIds.eight }
		});
		expect(res.status).toBe(200);
		const rows = all().filter((f) => ids.includes(f.id));
		expect(
			rows.every((f) => f.packTypeId === packTypeId && f.state === 'hung' && f.modeId === type.modeIds.eight)
		).toBe(true);
	});

	it('a bad field on one fixture refuses the batch: a mode that runs one past 512 leaves all three as they were', async () => {
		// the last DECK unit sits at 175…180; move it to 507 (6 slots: 507…512), then ask for the 8-slot mode
		const [last] = idsOf(130, 130);
		const moved = await as.programmer.fetch(`/api/projects/${pid}/fixtures/${last}`, {
			method: 'PATCH',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ control: { kind: 'dmx', universeId: uni, address: 507 }, version: 1 })
		});
		expect(moved.status).toBe(200);
		const ids = [...idsOf(110, 111), last];
		const res = await bulk({ action: 'set', ids, fields: { modeId: type.modeIds.eight } });
		expect(res.status).toBe(400);
		expect(
			all()
				.filter((f) => ids.includes(f.id))
				.every((f) => f.modeId === type.modeIds.six)
		).toBe(true);
	});

	it('refuses a feed of a pack type that does not exist, and ids of another project', async () => {
		const ids = idsOf(112, 113);
		const res = await bulk({ action: 'set', ids, fields: { feed: { kind: 'battery', packTypeId: 999999 } } });
		expect(res.status).toBe(400);
		expect(
			all()
				.filter((f) => ids.includes(f.id))
				.every((f) => f.packTypeId === null)
		).toBe(true);
		// a fixture of another project, named by id in this project's bulk call
		const db = server.db();
		const otherType = makeType(db, otherPid, { one: channels(1) });
		const theirs = makeFixture(db, {
			projectId: otherPid,
			number: 1,
			label: 'THEIRS',
			typeId: otherType.type.id,
			modeId: otherType.modeIds.one
		});
		const foreign = await bulk({ action: 'relabel', ids: [...ids, theirs.id], pattern: 'MINE' });
		expect(foreign.status).toBe(404);
		expect(
			all()
				.filter((f) => ids.includes(f.id))
				.some((f) => f.label === 'MINE')
		).toBe(false);
		expect(db.select().from(fixtures).where(eq(fixtures.id, theirs.id)).get()!.label).toBe('THEIRS');
	});

	it('electricians may not use bulk tools', async () => {
		const res = await as.electrician.post(`/api/projects/${pid}/fixtures/bulk`, {
			action: 'set',
			ids: idsOf(114, 114),
			fields: { state: 'checked' }
		});
		expect(res.status).toBe(403);
	});
});
