import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { channels, makeFixture, makeReceiver, makeType, makeUniverse } from '../helpers/patch-factories';
import { startServer, type TestServer } from '../helpers/server';
import { auditLog } from '../../src/lib/server/db/schema';

// Universes, fixture types and receivers through the JSON API (DESIGN.md "JSON API"):
// shapes, validation, roles, not-found for other projects, stale versions, in-use refusals.

let server: TestServer;
let pid: number;
let otherPid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;

beforeAll(async () => {
	server = await startServer();
	const { project, crew, outsider } = await makeCrew(server.db());
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
	otherPid = (await makeCrew(server.db())).project.id;
});
afterAll(() => server?.stop());

const base = () => `/api/projects/${pid}`;

describe('universes', () => {
	it('creates a universe and lists it with its computed numbers (E1.31 multicast 239.255.hi.lo; Art-Net offset 1 by default)', async () => {
		const res = await as.programmer.post(`${base()}/universes`, { number: 258, name: 'Deck', transport: 'sacn' });
		expect(res.status).toBe(201);
		const u = await res.json();
		// ANSI E1.31: universe 258 = 0x0102 → 239.255.1.2
		expect(u.sacn).toEqual({ universe: 258, group: '239.255.1.2' });
		// paper 258 − 1 = port-address 257 = 0x101: net 1, sub-net 0, universe 1 (Art-Net 15-bit split 7/4/4, from memory)
		expect(u.artnet).toEqual({ net: 1, subnet: 0, universe: 1, portAddress: 257 });
		expect(u.slotsUsed).toBe(0);
		const list = await (await as.viewer.get(`${base()}/universes`)).json();
		expect(list.universes.map((x: { number: number }) => x.number)).toContain(258);
		const audit = server
			.db()
			.select()
			.from(auditLog)
			.all()
			.filter((a) => a.action === 'universe.create' && a.entityId === String(u.id));
		expect(audit).toHaveLength(1);
	});

	it('refuses bad input with 400 and issues, unknown fields, and a number already used (409)', async () => {
		const bad = await as.programmer.post(`${base()}/universes`, { number: 64000 });
		expect(bad.status).toBe(400);
		const body = await bad.json();
		expect(body.error.code).toBe('invalid');
		expect(body.error.issues[0].path).toEqual(['number']);
		const unknown = await as.programmer.post(`${base()}/universes`, { number: 5, colour: 'red' });
		expect(unknown.status).toBe(400);
		await as.programmer.post(`${base()}/universes`, { number: 6 });
		const dup = await as.programmer.post(`${base()}/universes`, { number: 6 });
		expect(dup.status).toBe(409);
		expect((await dup.json()).error.message).toContain('Universe 6 already exists');
	});

	it('401 anonymous, 403 for electrician and viewer writes, 404 for outsiders and other projects', async () => {
		expect((await server.anonymous().get(`${base()}/universes`)).status).toBe(401);
		expect((await as.electrician.post(`${base()}/universes`, { number: 9 })).status).toBe(403);
		expect((await as.viewer.post(`${base()}/universes`, { number: 9 })).status).toBe(403);
		expect((await as.outsider.get(`${base()}/universes`)).status).toBe(404);
		const u = makeUniverse(server.db(), otherPid, 1);
		const res = await as.programmer.patch(`${base()}/universes/${u.id}`, { name: 'mine now', version: 1 });
		expect(res.status).toBe(404);
		expect((await res.json()).error.code).toBe('not-found');
	});

	it('PATCH bumps the version; a stale version answers 409 with the current object', async () => {
		const u = await (await as.programmer.post(`${base()}/universes`, { number: 20 })).json();
		const ok = await as.programmer.patch(`${base()}/universes/${u.id}`, { name: 'Stage left', version: 1 });
		expect(ok.status).toBe(200);
		expect((await ok.json()).version).toBe(2);
		const stale = await as.programmer.patch(`${base()}/universes/${u.id}`, { name: 'Stage right', version: 1 });
		expect(stale.status).toBe(409);
		const body = await stale.json();
		expect(body.error.code).toBe('stale');
		expect(body.current).toMatchObject({ id: u.id, name: 'Stage left', version: 2 });
	});

	it('DELETE of a universe in use is refused naming the fixtures; ?detach=true sets them to manual', async () => {
		const db = server.db();
		const u = makeUniverse(db, pid, 30);
		const { type, modeIds } = makeType(db, pid, { basic: channels(4) });
		const f = makeFixture(db, {
			projectId: pid,
			number: 3001,
			typeId: type.id,
			modeId: modeIds.basic,
			controlKind: 'dmx',
			universeId: u.id,
			address: 1
		});
		const refused = await as.programmer.delete(`${base()}/universes/${u.id}`);
		expect(refused.status).toBe(409);
		const body = await refused.json();
		expect(body.usedBy).toEqual([expect.objectContaining({ id: f.id, number: 3001 })]);
		const ok = await as.programmer.delete(`${base()}/universes/${u.id}?detach=true`);
		expect(ok.status).toBe(204);
		const after = await (await as.viewer.get(`${base()}/fixtures/${f.id}`)).json();
		expect(after.control).toEqual({ kind: 'manual' });
		expect(after.version).toBe(2);
	});

	it('a body over 1 MB answers 413', async () => {
		const res = await as.programmer.post(`${base()}/universes`, { number: 40, notes: 'x'.repeat(1024 * 1024 + 10) });
		expect(res.status).toBe(413);
		expect((await res.json()).error.code).toBe('too-large');
	});
});

describe('fixture types (modes inline)', () => {
	const rgbw16 = {
		name: '16-bit RGBW',
		channels: [
			{ offset: 1, parameter: 'intensity', bits: 16 },
			{ offset: 3, parameter: 'red', bits: 8 },
			{ offset: 4, parameter: 'green', bits: 8 },
			{ offset: 5, parameter: 'blue', bits: 8 },
			{ offset: 6, parameter: 'white', bits: 8 },
			{ offset: null, parameter: 'fan', bits: 8 }
		]
	};

	it('creates a type; a mode’s slots run from offset 1 to its highest channel’s last slot (DESIGN "Mode")', async () => {
		const res = await as.programmer.post(`${base()}/types`, {
			maker: 'Testworks',
			model: 'Strip',
			modes: [rgbw16, { name: 'sparse', channels: [{ offset: 10, parameter: 'intensity', bits: 16 }] }]
		});
		expect(res.status).toBe(201);
		const t = await res.json();
		expect(t.modes.map((m: { slots: number }) => m.slots)).toEqual([6, 11]);
		expect(t.modes[0].channels[0]).toEqual({ offset: 1, parameter: 'intensity', bits: 16, default: 0 });
		const list = await (await as.electrician.get(`${base()}/types`)).json();
		expect(list.types.some((x: { id: number }) => x.id === t.id)).toBe(true);
	});

	it('refuses a second type with the same maker + model in any letter case, naming the pair (issue 16)', async () => {
		const body = { maker: 'Dupeworks', model: 'Panel 4', modes: [rgbw16] };
		expect((await as.programmer.post(`${base()}/types`, body)).status).toBe(201);
		const again = await as.programmer.post(`${base()}/types`, { ...body, maker: ' dupeWORKS', model: 'panel 4' });
		expect(again.status).toBe(409);
		const err = (await again.json()).error;
		expect(err.code).toBe('duplicate');
		expect(err.message).toContain('Dupeworks Panel 4');
		const other = await (await as.programmer.post(`${base()}/types`, { ...body, model: 'Panel 8' })).json();
		const rename = await as.programmer.patch(`${base()}/types/${other.id}`, {
			model: 'PANEL 4',
			version: other.version
		});
		expect(rename.status).toBe(409);
	});

	it('refuses two channels on one slot, bits outside 8/16/24, offset 0, and a footprint past 512', async () => {
		const cases = [
			[
				{ offset: 1, parameter: 'intensity', bits: 16 },
				{ offset: 2, parameter: 'hue', bits: 8 }
			],
			[{ offset: 1, parameter: 'intensity', bits: 12 }],
			[{ offset: 0, parameter: 'intensity', bits: 8 }],
			[{ offset: 511, parameter: 'intensity', bits: 24 }]
		];
		for (const chs of cases) {
			const res = await as.programmer.post(`${base()}/types`, {
				maker: 'T',
				model: 'M',
				modes: [{ name: 'm', channels: chs }]
			});
			expect(res.status).toBe(400);
			const body = await res.json();
			expect(body.error.issues[0].path.slice(0, 3)).toEqual(['modes', 0, 'channels']);
		}
	});

	it('PATCH replacing modes keeps the ids it names, refuses dropping a used mode (409 naming fixtures), deletes unused ones', async () => {
		const db = server.db();
		const { type, modeIds } = makeType(db, pid, { a: channels(2), b: channels(3), c: channels(1) });
		const f = makeFixture(db, { projectId: pid, number: 4001, typeId: type.id, modeId: modeIds.a });
		const dropUsed = await as.programmer.patch(`${base()}/types/${type.id}`, {
			version: 1,
			modes: [{ id: modeIds.b, name: 'b', channels: [] }]
		});
		expect(dropUsed.status).toBe(409);
		expect((await dropUsed.json()).usedBy).toEqual([expect.objectContaining({ id: f.id, number: 4001 })]);
		const ok = await as.programmer.patch(`${base()}/types/${type.id}`, {
			version: 1,
			modes: [
				{ id: modeIds.a, name: 'a renamed', channels: [{ offset: 1, parameter: 'intensity', bits: 16 }] },
				{ name: 'new', channels: [] }
			]
		});
		expect(ok.status).toBe(200);
		const t = await ok.json();
		expect(t.version).toBe(2);
		expect(t.modes[0]).toMatchObject({ id: modeIds.a, name: 'a renamed', slots: 2 });
		expect(t.modes).toHaveLength(2);
		expect(t.modes.map((m: { id: number }) => m.id)).not.toContain(modeIds.c);
		const foreign = await as.programmer.patch(`${base()}/types/${type.id}`, {
			version: 2,
			modes: [
				{ id: 999999, name: 'x', channels: [] },
				{ id: modeIds.a, name: 'a', channels: [] }
			]
		});
		expect(foreign.status).toBe(400);
	});

	it('DELETE of a type in use answers 409 naming the fixtures; an unused type goes', async () => {
		const db = server.db();
		const used = makeType(db, pid, { m: channels(1) });
		makeFixture(db, { projectId: pid, number: 4101, typeId: used.type.id, modeId: used.modeIds.m });
		const refused = await as.programmer.delete(`${base()}/types/${used.type.id}`);
		expect(refused.status).toBe(409);
		expect((await refused.json()).error.message).toContain('4101');
		const unused = makeType(db, pid, { m: channels(1) });
		expect((await as.programmer.delete(`${base()}/types/${unused.type.id}`)).status).toBe(204);
		expect((await as.viewer.get(`${base()}/types/${unused.type.id}`)).status).toBe(404);
		expect((await as.viewer.delete(`${base()}/types/${used.type.id}`)).status).toBe(403);
	});
});

describe('receivers', () => {
	it('creates with labels; channel count per protocol (SBUS 16 + 2 digital, CRSF 16, PPM 8 — common practice)', async () => {
		const res = await as.programmer.post(`${base()}/receivers`, {
			name: 'Crane',
			protocol: 'ppm',
			labels: { '1': 'left stick up/down' }
		});
		expect(res.status).toBe(201);
		const r = await res.json();
		expect(r).toMatchObject({ protocol: 'ppm', channelCount: 8, labels: { '1': 'left stick up/down' }, version: 1 });
		const beyond = await as.programmer.post(`${base()}/receivers`, {
			name: 'Crane',
			protocol: 'ppm',
			labels: { '9': 'knob' }
		});
		expect(beyond.status).toBe(400);
		expect((await beyond.json()).error.issues[0].path).toEqual(['labels', '9']);
	});

	it('PATCH replaces labels as a whole; a protocol change that strands labels is refused; stale is 409', async () => {
		const r = await (
			await as.programmer.post(`${base()}/receivers`, {
				name: 'Car',
				protocol: 'sbus',
				labels: { '1': 'a', '17': 'switch A' }
			})
		).json();
		const shrink = await as.programmer.patch(`${base()}/receivers/${r.id}`, { protocol: 'crsf', version: 1 });
		expect(shrink.status).toBe(400);
		const ok = await as.programmer.patch(`${base()}/receivers/${r.id}`, { labels: { '2': 'b' }, version: 1 });
		expect(ok.status).toBe(200);
		expect((await ok.json()).labels).toEqual({ '2': 'b' });
		const stale = await as.programmer.patch(`${base()}/receivers/${r.id}`, { name: 'x', version: 1 });
		expect(stale.status).toBe(409);
		expect((await stale.json()).current.labels).toEqual({ '2': 'b' });
	});

	it('DELETE in use: 409 naming fixtures; ?detach=true moves them to manual', async () => {
		const db = server.db();
		const r = makeReceiver(db, pid);
		const { type, modeIds } = makeType(db, pid, { m: channels(2) });
		const f = makeFixture(db, {
			projectId: pid,
			number: 5001,
			typeId: type.id,
			modeId: modeIds.m,
			controlKind: 'rc',
			receiverId: r.id,
			rcChannels: { p1: 1, p2: 2 }
		});
		const refused = await as.programmer.delete(`${base()}/receivers/${r.id}`);
		expect(refused.status).toBe(409);
		expect((await refused.json()).usedBy[0].id).toBe(f.id);
		expect((await as.programmer.delete(`${base()}/receivers/${r.id}?detach=1`)).status).toBe(204);
		expect((await (await as.viewer.get(`${base()}/fixtures/${f.id}`)).json()).control).toEqual({ kind: 'manual' });
	});
});
