import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { channels, makeFixture, makeReceiver, makeType, makeUniverse } from '../helpers/patch-factories';
import { startServer, type TestServer } from '../helpers/server';
import { auditLog, fixtures } from '../../src/lib/server/db/schema';

// Fixtures through the JSON API: validation that needs the database, roles (electricians set
// state and notes only), optimistic concurrency, batches, follow-leaders, autopatch, and
// conflicts computed by the engine on what the API wrote.

let server: TestServer;
let pid: number;
let otherPid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;
let uni: number;
let otherUni: number;
let type: ReturnType<typeof makeType>;
let otherType: ReturnType<typeof makeType>;
let number = 100;

beforeAll(async () => {
	server = await startServer();
	const db = server.db();
	const { project, crew, outsider } = await makeCrew(db);
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
	otherPid = (await makeCrew(db)).project.id;
	uni = makeUniverse(db, pid, 1).id;
	otherUni = makeUniverse(db, otherPid, 1).id;
	type = makeType(db, pid, {
		six: channels(6),
		ten: [...channels(6), { offset: 7, parameter: 'cct', bits: 16 }, { offset: 9, parameter: 'fan', bits: 16 }],
		sparse: [
			{ offset: 1, parameter: 'intensity', bits: 16 },
			{ offset: 3, parameter: 'hue', bits: 8 }
		]
	});
	otherType = makeType(db, pid, { one: channels(1) }, 'Other');
});
afterAll(() => server?.stop());

const base = () => `/api/projects/${pid}`;
const dmx = (address: number, universeId = uni) => ({ kind: 'dmx', universeId, address });
function body(extra: Record<string, unknown> = {}) {
	return { number: ++number, typeId: type.type.id, modeId: type.modeIds.six, control: dmx(1), ...extra };
}
async function create(extra: Record<string, unknown> = {}) {
	const res = await as.programmer.post(`${base()}/fixtures`, body(extra));
	expect(res.status).toBe(201);
	return res.json();
}
const row = (id: number) => server.db().select().from(fixtures).where(eq(fixtures.id, id)).get()!;

describe('creating fixtures', () => {
	it('one object answers 201 with the fixture shape', async () => {
		const f = await create({ label: 'CAR KEY 2', linkGroup: 'bow', look: { hue: 30 } });
		expect(f).toMatchObject({
			label: 'CAR KEY 2',
			state: 'planned',
			version: 1,
			linkGroup: 'bow',
			control: dmx(1),
			look: { hue: 30, cct: null }
		});
		const list = await (await as.viewer.get(`${base()}/fixtures`)).json();
		expect(list.fixtures.some((x: { id: number }) => x.id === f.id)).toBe(true);
	});

	it('an array is one transaction: one bad item refuses all, naming its index', async () => {
		const before = server.db().select().from(fixtures).all().length;
		const res = await as.programmer.post(`${base()}/fixtures`, [body(), body({ control: dmx(510) })]);
		expect(res.status).toBe(400);
		const err = await res.json();
		expect(err.error.issues[0].path).toEqual([1, 'control', 'address']);
		expect(server.db().select().from(fixtures).all().length).toBe(before);
		const ok = await as.programmer.post(`${base()}/fixtures`, [body(), body()]);
		expect(ok.status).toBe(201);
		expect((await ok.json()).fixtures).toHaveLength(2);
	});

	it.each([
		['a universe of another project', () => body({ control: dmx(1, otherUni) }), ['control', 'universeId']],
		['a mode of another type', () => body({ modeId: otherType.modeIds.one }), ['modeId']],
		['address 0 (E1.11 slots are 1–512)', () => body({ control: dmx(0) }), ['control', 'address']],
		['a 6-slot footprint from 508 (would end on 513)', () => body({ control: dmx(508) }), ['control', 'address']],
		[
			'a dmx-map parameter the mode lacks',
			() =>
				body({ modeId: type.modeIds.sparse, control: { kind: 'dmx-map', universeId: uni, addresses: { blue: 4 } } }),
			['control', 'addresses', 'blue']
		],
		[
			'a 16-bit dmx-map parameter at 512',
			() =>
				body({
					modeId: type.modeIds.sparse,
					control: { kind: 'dmx-map', universeId: uni, addresses: { intensity: 512 } }
				}),
			['control', 'addresses', 'intensity']
		],
		['an unknown state', () => body({ state: 'lost' }), ['state']],
		['a label over 60 characters', () => body({ label: 'L'.repeat(61) }), ['label']],
		['an unknown field', () => body({ dimmer: 1 }), []],
		[
			'following a fixture of no project',
			() => body({ control: { kind: 'follow', leaderId: 99999999 } }),
			['control', 'leaderId']
		]
	])('refuses %s with 400 and the field path', async (_, make, path) => {
		const res = await as.programmer.post(`${base()}/fixtures`, make());
		expect(res.status).toBe(400);
		const err = await res.json();
		expect(err.error.code).toBe('invalid');
		expect(err.error.issues[0].path).toEqual(path);
	});

	it('the overflow message says where the footprint would end', async () => {
		const res = await as.programmer.post(`${base()}/fixtures`, body({ control: dmx(508) }));
		expect((await res.json()).error.message).toBe(
			'This mode needs 6 slots; from address 508 it would run to slot 513, past 512. Start at 507 or lower.'
		);
	});

	it('a fixture number already used answers 409', async () => {
		const f = await create();
		const res = await as.programmer.post(`${base()}/fixtures`, body({ number: f.number }));
		expect(res.status).toBe(409);
		expect((await res.json()).error.message).toContain(`Fixture number ${f.number} is already taken`);
	});

	it('RC channels must be within the receiver’s protocol (PPM: 8)', async () => {
		const r = makeReceiver(server.db(), pid, 'ppm');
		const res = await as.programmer.post(
			`${base()}/fixtures`,
			body({ control: { kind: 'rc', receiverId: r.id, channels: { p1: 9 } } })
		);
		expect(res.status).toBe(400);
		expect((await res.json()).error.issues[0].path).toEqual(['control', 'channels', 'p1']);
	});

	it('viewers and electricians cannot create; outsiders get 404', async () => {
		expect((await as.viewer.post(`${base()}/fixtures`, body())).status).toBe(403);
		expect((await as.electrician.post(`${base()}/fixtures`, body())).status).toBe(403);
		expect((await as.outsider.post(`${base()}/fixtures`, body())).status).toBe(404);
	});
});

describe('changing fixtures', () => {
	it('PATCH changes fields, bumps the version and audits before/after', async () => {
		const f = await create();
		const res = await as.programmer.patch(`${base()}/fixtures/${f.id}`, {
			version: 1,
			label: 'BOW 1',
			control: dmx(11)
		});
		expect(res.status).toBe(200);
		expect(await res.json()).toMatchObject({ label: 'BOW 1', version: 2, control: dmx(11) });
		const audit = server
			.db()
			.select()
			.from(auditLog)
			.where(eq(auditLog.entityId, String(f.id)))
			.all()
			.filter((a) => a.action === 'fixture.update');
		expect(audit).toHaveLength(1);
		expect(audit[0].before).toMatchObject({ label: '', version: 1 });
		expect(audit[0].after).toMatchObject({ label: 'BOW 1', version: 2 });
	});

	it('an electrician changing control or address is 403 and writes nothing; state and notes are 200', async () => {
		const f = await create();
		for (const change of [{ control: dmx(40) }, { address: 40 }, { label: 'x' }]) {
			const res = await as.electrician.patch(`${base()}/fixtures/${f.id}`, { version: 1, ...change });
			expect(res.status).toBe(403);
		}
		expect(row(f.id)).toMatchObject({ address: 1, label: '', version: 1 });
		const ok = await as.electrician.patch(`${base()}/fixtures/${f.id}`, {
			version: 1,
			state: 'hung',
			notes: 'on the rail'
		});
		expect(ok.status).toBe(200);
		expect(row(f.id)).toMatchObject({ state: 'hung', notes: 'on the rail', version: 2, address: 1 });
		expect((await as.viewer.patch(`${base()}/fixtures/${f.id}`, { version: 2, state: 'checked' })).status).toBe(403);
	});

	it('a stale version is 409 with the current fixture', async () => {
		const f = await create();
		await as.programmer.patch(`${base()}/fixtures/${f.id}`, { version: 1, label: 'first' });
		const res = await as.programmer.patch(`${base()}/fixtures/${f.id}`, { version: 1, label: 'second' });
		expect(res.status).toBe(409);
		const err = await res.json();
		expect(err.error.code).toBe('stale');
		expect(err.current).toMatchObject({ id: f.id, label: 'first', version: 2 });
	});

	it('ten concurrent PATCHes with the same version: exactly one 200, nine 409, the row is the winner’s', async () => {
		const f = await create();
		const results = await Promise.all(
			Array.from({ length: 10 }, (_, i) =>
				as.programmer
					.patch(`${base()}/fixtures/${f.id}`, { version: 1, label: `racer ${i}` })
					.then(async (r) => ({ status: r.status, body: await r.json() }))
			)
		);
		const winners = results.filter((r) => r.status === 200);
		expect(winners).toHaveLength(1);
		expect(results.filter((r) => r.status === 409)).toHaveLength(9);
		expect(row(f.id)).toMatchObject({ label: winners[0].body.label, version: 2 });
	});

	it('a PATCH of another project’s fixture id is 404', async () => {
		const foreign = makeFixture(server.db(), {
			projectId: otherPid,
			number: 1,
			typeId: makeType(server.db(), otherPid, { m: channels(1) }).type.id,
			modeId: makeType(server.db(), otherPid, { m: channels(1) }).modeIds.m
		});
		expect((await as.programmer.patch(`${base()}/fixtures/${foreign.id}`, { version: 1, label: 'x' })).status).toBe(
			404
		);
		expect((await as.programmer.delete(`${base()}/fixtures/${foreign.id}`)).status).toBe(404);
	});

	it('bulk PATCH moves many in one transaction; one stale version refuses the batch and writes nothing', async () => {
		const a = await create();
		const b = await create();
		const ok = await as.programmer.patch(`${base()}/fixtures`, {
			fixtures: [
				{ id: a.id, version: 1, control: dmx(101) },
				{ id: b.id, version: 1, control: dmx(201) }
			]
		});
		expect(ok.status).toBe(200);
		expect((await ok.json()).fixtures.map((f: { version: number }) => f.version)).toEqual([2, 2]);
		const stale = await as.programmer.patch(`${base()}/fixtures`, {
			fixtures: [
				{ id: a.id, version: 2, control: dmx(301) },
				{ id: b.id, version: 1, control: dmx(401) }
			]
		});
		expect(stale.status).toBe(409);
		const err = await stale.json();
		expect(err.error.code).toBe('stale');
		expect(err.stale).toEqual([b.id]);
		expect(err.current.map((f: { id: number }) => f.id)).toEqual([a.id, b.id]);
		expect([row(a.id).address, row(b.id).address]).toEqual([101, 201]);
		const mine = await as.electrician.patch(`${base()}/fixtures`, {
			fixtures: [{ id: a.id, version: 2, control: dmx(5) }]
		});
		expect(mine.status).toBe(403);
	});

	it('bulk PATCH may swap two fixture numbers; a clash with a third is 409; bad items are 400 with their index', async () => {
		const [a, b, c] = [await create(), await create(), await create()];
		const swap = await as.programmer.patch(`${base()}/fixtures`, {
			fixtures: [
				{ id: a.id, version: 1, number: b.number },
				{ id: b.id, version: 1, number: a.number }
			]
		});
		expect(swap.status).toBe(200);
		expect([row(a.id).number, row(b.id).number]).toEqual([b.number, a.number]);
		const clash = await as.programmer.patch(`${base()}/fixtures`, {
			fixtures: [{ id: a.id, version: 2, number: c.number }]
		});
		expect(clash.status).toBe(409);
		expect((await clash.json()).error.code).toBe('duplicate');
		const bad = await as.programmer.patch(`${base()}/fixtures`, {
			fixtures: [
				{ id: a.id, version: 2, label: 'ok' },
				{ id: b.id, version: 2, control: dmx(600) }
			]
		});
		expect(bad.status).toBe(400);
		expect((await bad.json()).error.issues[0].path).toEqual(['fixtures', 1, 'control', 'address']);
		expect(row(a.id).label).toBe('');
	});

	it('changing a patched fixture to a longer mode that would run past 512 is refused (400)', async () => {
		const f = await create({ control: dmx(505) });
		const res = await as.programmer.patch(`${base()}/fixtures/${f.id}`, { version: 1, modeId: type.modeIds.ten });
		expect(res.status).toBe(400);
		expect((await res.json()).error.message).toContain('run to slot 514, past 512');
		expect(row(f.id).modeId).toBe(type.modeIds.six);
	});
});

describe('deleting fixtures', () => {
	it('a leader with followers: 409 naming them; ?detach=true makes them manual', async () => {
		const leader = await create();
		const follower = await create({ control: { kind: 'follow', leaderId: leader.id } });
		const refused = await as.programmer.delete(`${base()}/fixtures/${leader.id}`);
		expect(refused.status).toBe(409);
		expect((await refused.json()).usedBy).toEqual([
			expect.objectContaining({ id: follower.id, number: follower.number })
		]);
		expect((await as.electrician.delete(`${base()}/fixtures/${leader.id}`)).status).toBe(403);
		expect((await as.programmer.delete(`${base()}/fixtures/${leader.id}?detach=true`)).status).toBe(204);
		expect(row(follower.id)).toMatchObject({ controlKind: 'manual', leaderId: null, version: 2 });
		expect((await as.viewer.get(`${base()}/fixtures/${leader.id}`)).status).toBe(404);
	});

	it('a selection goes in one request: a follower outside it refuses the batch and nothing is deleted; detach makes it manual', async () => {
		const leader = await create();
		const other = await create();
		const insideFollower = await create({ control: { kind: 'follow', leaderId: leader.id } });
		const outsideFollower = await create({ control: { kind: 'follow', leaderId: leader.id } });
		const ids = [leader.id, other.id, insideFollower.id];
		const refused = await as.programmer.json('DELETE', `${base()}/fixtures`, { ids });
		expect(refused.status).toBe(409);
		const body = await refused.json();
		expect(body.error.message).toContain(`${outsideFollower.number} follows ${leader.number}`);
		expect(body.usedBy).toEqual([expect.objectContaining({ id: outsideFollower.id })]);
		for (const id of ids) expect(row(id)).toBeDefined();
		expect((await as.electrician.json('DELETE', `${base()}/fixtures`, { ids })).status).toBe(403);
		const bad = await as.programmer.json('DELETE', `${base()}/fixtures`, { ids: [other.id, other.id] });
		expect(bad.status).toBe(400);
		const unknown = await as.programmer.json('DELETE', `${base()}/fixtures`, { ids: [other.id, 99999999] });
		expect(unknown.status).toBe(404);
		expect(row(other.id)).toBeDefined();

		const done = await as.programmer.json('DELETE', `${base()}/fixtures`, { ids, detach: true });
		expect(done.status).toBe(200);
		expect(await done.json()).toEqual({ deleted: ids, detached: [outsideFollower.id] });
		for (const id of ids) expect(row(id)).toBeUndefined();
		expect(row(outsideFollower.id)).toMatchObject({ controlKind: 'manual', leaderId: null });
	});
});

describe('autopatch', () => {
	it('previews first fit around what is patched, excluding the fixtures being moved; writes only with apply', async () => {
		const db = server.db();
		const u = makeUniverse(db, pid, 50).id;
		const blocker = await create({ control: dmx(1, u) });
		const moving = [await create({ control: dmx(7, u) }), await create(), await create()];
		const ids = moving.map((f) => f.id);
		const preview = await as.programmer.post(`${base()}/autopatch`, { fixtureIds: ids, universeId: u, start: 1 });
		expect(preview.status).toBe(200);
		const p = await preview.json();
		// six-slot footprints after the blocker's 1–6: 7, 13, 19 (first fit; the mover's own 7–12 does not count)
		expect(p.placed).toEqual([
			{ fixtureId: ids[0], address: 7 },
			{ fixtureId: ids[1], address: 13 },
			{ fixtureId: ids[2], address: 19 }
		]);
		expect(p.applied).toBe(false);
		expect(row(ids[1]).universeId).toBe(uni);
		const aligned = await (
			await as.programmer.post(`${base()}/autopatch`, { fixtureIds: ids, universeId: u, align: 10, apply: true })
		).json();
		// round addresses 1, 11, 21 …: 1 is taken by the blocker
		expect(aligned.placed.map((x: { address: number }) => x.address)).toEqual([11, 21, 31]);
		expect(row(ids[2])).toMatchObject({ universeId: u, address: 31, controlKind: 'dmx', version: 2 });
		expect(row(blocker.id).address).toBe(1);
	});

	it('reports what does not fit instead of dropping it', async () => {
		const u = makeUniverse(server.db(), pid, 51).id;
		const f = await create();
		const res = await (
			await as.programmer.post(`${base()}/autopatch`, { fixtureIds: [f.id], universeId: u, start: 510 })
		).json();
		expect(res.placed).toEqual([]);
		expect(res.unplaced[0]).toMatchObject({ fixtureId: f.id });
		expect(res.unplaced[0].reason).toContain('needs 6 slots');
	});

	it('refuses a universe of another project (400) and viewers (403)', async () => {
		const f = await create();
		expect((await as.programmer.post(`${base()}/autopatch`, { fixtureIds: [f.id], universeId: otherUni })).status).toBe(
			400
		);
		expect((await as.viewer.post(`${base()}/autopatch`, { fixtureIds: [f.id], universeId: uni })).status).toBe(403);
	});
});

describe('conflicts the engine finds in what the API wrote', () => {
	async function conflictsIn(universeId: number) {
		const res = await as.viewer.get(`${base()}/conflicts`);
		expect(res.status).toBe(200);
		return (
			(await res.json()).conflicts as {
				kind: string;
				severity: string;
				universeId?: number;
				fixtureIds: number[];
				slots?: number[];
			}[]
		).filter((c) => c.universeId === universeId);
	}

	it('a type edit that lengthens a used mode is allowed and shows as an overflow error (fixture writes refuse it)', async () => {
		const db = server.db();
		const u = makeUniverse(db, pid, 60).id;
		const t = makeType(db, pid, { m: channels(4) }, 'Grower');
		const f = await create({ typeId: t.type.id, modeId: t.modeIds.m, control: dmx(509, u) });
		const grown = await as.programmer.patch(`${base()}/types/${t.type.id}`, {
			version: 1,
			modes: [
				{
					id: t.modeIds.m,
					name: 'm',
					channels: [
						{ offset: 1, parameter: 'intensity', bits: 16 },
						{ offset: 3, parameter: 'hue', bits: 16 },
						{ offset: 5, parameter: 'cct', bits: 16 }
					]
				}
			]
		});
		expect(grown.status).toBe(200);
		const c = await conflictsIn(u);
		// 16-bit ×3 = 6 slots from 509 ends on 514: E1.11 has 512 slots and footprints never wrap
		expect(c).toEqual([expect.objectContaining({ kind: 'overflow', severity: 'error', fixtureIds: [f.id] })]);
	});

	it('a sparse dmx-map fixture overlapping a contiguous one is an overlap error naming the slots', async () => {
		const u = makeUniverse(server.db(), pid, 61).id;
		const a = await create({ control: dmx(1, u) });
		const b = await create({
			modeId: type.modeIds.sparse,
			control: { kind: 'dmx-map', universeId: u, addresses: { intensity: 5, hue: 100 } }
		});
		const c = await conflictsIn(u);
		expect(c).toHaveLength(1);
		expect(c[0]).toMatchObject({ kind: 'overlap', severity: 'error', slots: [5, 6] });
		expect([...c[0].fixtureIds].sort((x, y) => x - y)).toEqual([a.id, b.id].sort((x, y) => x - y));
	});

	it('two units at one address in one link group are linked (info); without a group they are shared (warning)', async () => {
		const u = makeUniverse(server.db(), pid, 62).id;
		await create({ linkGroup: 'mast', control: dmx(1, u) });
		await create({ linkGroup: 'mast', control: dmx(1, u) });
		expect((await conflictsIn(u)).map((c) => [c.kind, c.severity])).toEqual([['linked', 'info']]);
		const v = makeUniverse(server.db(), pid, 63).id;
		await create({ control: dmx(1, v) });
		await create({ control: dmx(1, v) });
		expect((await conflictsIn(v)).map((c) => [c.kind, c.severity])).toEqual([['shared', 'warning']]);
	});
});

describe('the cached patch', () => {
	it('follows every write: another connection’s insert, then an API delete, show at once', async () => {
		const db = server.db();
		const u = makeUniverse(db, pid, 70).id;
		const a = await create({ control: dmx(1, u) });
		const kinds = async () =>
			((await (await as.viewer.get(`${base()}/conflicts`)).json()).conflicts as { kind: string; universeId?: number }[])
				.filter((c) => c.universeId === u)
				.map((c) => c.kind);
		expect(await kinds()).toEqual([]);
		// a 6-slot unit at 4 overlaps slots 4–6 of the one at 1 (written straight to the file, not through the server)
		const b = makeFixture(db, {
			projectId: pid,
			number: 9070,
			typeId: type.type.id,
			modeId: type.modeIds.six,
			controlKind: 'dmx',
			universeId: u,
			address: 4
		});
		expect(await kinds()).toEqual(['overlap']);
		expect((await as.programmer.delete(`${base()}/fixtures/${b.id}`)).status).toBe(204);
		expect(await kinds()).toEqual([]);
		expect((await as.programmer.patch(`${base()}/fixtures/${a.id}`, { version: 1, control: dmx(2, u) })).status).toBe(
			200
		);
		const patch = await (await as.viewer.get(`${base()}/patch`)).json();
		expect(patch.fixtures.find((f: { id: number }) => f.id === a.id).slots).toEqual([{ start: 2, end: 7 }]);
	});
});
