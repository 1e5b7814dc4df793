import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { eq, inArray, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { gdtfZip, PANEL_XML } from '../helpers/gdtf';
import { channels, makeFixture, makeType, makeUniverse } from '../helpers/patch-factories';
import { startServer, type Client, type TestServer } from '../helpers/server';
import { fixtures, fixtureTypes, modes, receivers, uploads } from '../../src/lib/server/db/schema';

// Issue 20, "no write can half-fail": every refusal answers the JSON error shape and leaves
// neither rows nor files behind.

// PNG signature (ISO/IEC 15948)
const PNG = Buffer.from('89504e470d0a1a0a0000000d4948445200000001', 'hex');

function photoForm(bytes: Uint8Array) {
	const form = new FormData();
	form.append('file', new Blob([new Uint8Array(bytes)], { type: 'image/png' }), 'rig.png');
	return form;
}

function filesUnder(dir: string): string[] {
	if (!existsSync(dir)) return [];
	return readdirSync(dir, { recursive: true, withFileTypes: true })
		.filter((d) => d.isFile())
		.map((d) => d.name);
}

async function expectJsonError(res: Response, status: number, code?: string) {
	expect(res.status).toBe(status);
	expect(res.headers.get('content-type')).toContain('application/json');
	const body = await res.json();
	expect(typeof body.error.message).toBe('string');
	if (code) expect(body.error.code).toBe(code);
	return body;
}

describe('the demo project', () => {
	let server: TestServer;
	let owner: Client;
	let pid: number;
	beforeAll(async () => {
		server = await startServer({ demo: true });
		owner = await server.signIn('owner@demo.test');
		pid = (await (await owner.get('/api/projects')).json()).projects[0].id;
	});
	afterAll(() => server?.stop());

	it('deletes with 204, leaving no row of it in any table and no photo file', async () => {
		const db = server.db();
		const fixture = db.select().from(fixtures).where(eq(fixtures.projectId, pid)).get()!;
		const photo = await owner.fetch(`/api/projects/${pid}/fixtures/${fixture.id}/photos`, {
			method: 'POST',
			body: photoForm(PNG)
		});
		expect(photo.status).toBe(201);
		expect(filesUnder(server.uploadsDir).length).toBeGreaterThan(0);
		const typeIds = db.select({ id: fixtureTypes.id }).from(fixtureTypes).where(eq(fixtureTypes.projectId, pid)).all();
		const modeIds = db
			.select({ id: modes.id })
			.from(modes)
			.where(
				inArray(
					modes.typeId,
					typeIds.map((t) => t.id)
				)
			)
			.all();
		const receiverIds = db.select({ id: receivers.id }).from(receivers).where(eq(receivers.projectId, pid)).all();
		expect(typeIds.length * modeIds.length * receiverIds.length).toBeGreaterThan(0);

		const res = await owner.delete(`/api/projects/${pid}`);
		expect(res.status).toBe(204);

		const tables = db
			.all<{ name: string }>(sql`select name from sqlite_master where type = 'table'`)
			.map((t) => t.name)
			.filter((n) => !n.startsWith('__') && !n.startsWith('sqlite_'));
		const left: Record<string, number> = {};
		for (const table of tables) {
			const cols = db.all<{ name: string }>(sql.raw(`pragma table_info("${table}")`)).map((c) => c.name);
			if (!cols.includes('project_id')) continue;
			const n = db.get<{ n: number }>(sql.raw(`select count(*) as n from "${table}" where project_id = ${pid}`))!.n;
			if (n > 0) left[table] = n;
		}
		const inList = (ids: { id: number }[]) => ids.map((x) => x.id).join(',') || '0';
		for (const [table, col, ids] of [
			['mode', 'type_id', typeIds],
			['mode_channel', 'mode_id', modeIds],
			['receiver_label', 'receiver_id', receiverIds]
		] as const) {
			const n = db.get<{ n: number }>(
				sql.raw(`select count(*) as n from "${table}" where ${col} in (${inList(ids)})`)
			)!.n;
			if (n > 0) left[table] = n;
		}
		expect(left).toEqual({});
		expect(tables).toContain('mode_channel');
		expect(filesUnder(server.uploadsDir)).toEqual([]);
		expect((await owner.get(`/api/projects/${pid}`)).status).toBe(404);
	});
});

describe('writes that refuse leave nothing behind', () => {
	let server: TestServer;
	let pid: number;
	let as: Awaited<ReturnType<typeof signInCrew>>;
	let typeId: number;
	let modeId: number;
	let universeId: number;
	beforeAll(async () => {
		server = await startServer();
		const db = server.db();
		const { project, crew, outsider } = await makeCrew(db);
		pid = project.id;
		as = await signInCrew(server, crew, outsider);
		const t = makeType(db, pid, {
			m: [...channels(2), { offset: 3, parameter: 'constructor' }, { offset: 4, parameter: 'prototype' }]
		});
		typeId = t.type.id;
		modeId = t.modeIds.m;
		universeId = makeUniverse(db, pid, 1).id;
	});
	afterAll(() => server?.stop());

	it('a partial project PATCH changes only the fields it names (the Art-Net offset stays)', async () => {
		const p = await (await as.owner.get(`/api/projects/${pid}`)).json();
		const set = await as.owner.patch(`/api/projects/${pid}`, {
			version: p.version,
			venue: 'Stage 4',
			notes: 'Night shoot',
			artnetOffset: 0
		});
		expect(set.status).toBe(200);
		const mid = await set.json();
		const res = await as.owner.patch(`/api/projects/${pid}`, { version: mid.version, name: 'Renamed' });
		expect(res.status).toBe(200);
		expect(await res.json()).toMatchObject({
			name: 'Renamed',
			venue: 'Stage 4',
			notes: 'Night shoot',
			artnetOffset: 0
		});
	});

	it('a photo whose fixture is deleted while it uploads answers 404 and keeps no file', async () => {
		const db = server.db();
		const f = makeFixture(db, { projectId: pid, number: 50, typeId, modeId });
		const encoded = new Response(photoForm(Buffer.concat([PNG, Buffer.alloc(64 * 1024)])));
		const realType = encoded.headers.get('content-type')!;
		const body = new Uint8Array(await encoded.arrayBuffer());
		let release!: () => void;
		const gate = new Promise<void>((r) => (release = r));
		const stream = new ReadableStream<Uint8Array>({
			async start(controller) {
				controller.enqueue(body.subarray(0, 1024));
				await gate;
				controller.enqueue(body.subarray(1024));
				controller.close();
			}
		});
		const pending = as.electrician.fetch(`/api/projects/${pid}/fixtures/${f.id}/photos`, {
			method: 'POST',
			headers: { 'content-type': realType },
			body: stream,
			duplex: 'half'
		} as RequestInit);
		// the server has checked the fixture and is reading the body; the fixture goes meanwhile
		await new Promise((r) => setTimeout(r, 500));
		db.delete(fixtures).where(eq(fixtures.id, f.id)).run();
		release();
		await expectJsonError(await pending, 404, 'not-found');
		expect(db.select().from(uploads).where(eq(uploads.fixtureId, f.id)).all()).toEqual([]);
		expect(filesUnder(server.uploadsDir)).toEqual([]);
	});

	it('refuses a "__proto__" address or channel key with 400 naming it (never silently dropped)', async () => {
		const raw = (control: string) =>
			as.programmer.fetch(`/api/projects/${pid}/fixtures`, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: `{"number": 60, "typeId": ${typeId}, "modeId": ${modeId}, "control": ${control}}`
			});
		const map = await expectJsonError(
			await raw(`{"kind": "dmx-map", "universeId": ${universeId}, "addresses": {"__proto__": 1, "p1": 1}}`),
			400
		);
		expect(JSON.stringify(map.error)).toContain('__proto__');
		const rec = await as.programmer.post(`/api/projects/${pid}/receivers`, { name: 'R' });
		expect(rec.status).toBe(201);
		const rc = await expectJsonError(
			await raw(`{"kind": "rc", "receiverId": ${(await rec.json()).id}, "channels": {"__proto__": 2}}`),
			400
		);
		expect(JSON.stringify(rc.error)).toContain('__proto__');
		const labels = await as.programmer.fetch(`/api/projects/${pid}/receivers`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: '{"name": "R2", "labels": {"__proto__": "pan"}}'
		});
		expect(JSON.stringify((await expectJsonError(labels, 400)).error)).toContain('__proto__');
		expect(server.db().select().from(fixtures).where(eq(fixtures.number, 60)).all()).toEqual([]);
	});

	it('stores "constructor" and "prototype" parameter keys as ordinary keys', async () => {
		const res = await as.programmer.fetch(`/api/projects/${pid}/fixtures`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: `{"number": 61, "typeId": ${typeId}, "modeId": ${modeId}, "control": {"kind": "dmx-map", "universeId": ${universeId}, "addresses": {"p1": 101, "p2": 102, "constructor": 103, "prototype": 104}}}`
		});
		expect(res.status).toBe(201);
		const id = (await res.json()).id;
		const back = await (await as.viewer.get(`/api/projects/${pid}/fixtures/${id}`)).json();
		expect(back.control.addresses).toEqual({ p1: 101, p2: 102, constructor: 103, prototype: 104 });
	});

	it('imports a GDTF attribute named "constructor" as a parameter of that name', async () => {
		const xml = PANEL_XML.replace('<LogicalChannel Attribute="CTC">', '<LogicalChannel Attribute="constructor">');
		expect(xml).not.toBe(PANEL_XML);
		const form = new FormData();
		form.set('file', new Blob([new Uint8Array(gdtfZip(xml))]), 'panel.gdtf');
		const res = await as.programmer.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: form });
		expect(res.status).toBe(200);
		const summary = await res.json();
		const params = summary.type.modes[0].channels.map((c: { parameter: string }) => c.parameter);
		expect(params).toContain('constructor');
	});
});

describe('a full disk', () => {
	let server: TestServer;
	let pid: number;
	let fixtureId: number;
	let owner: Client;
	const mountDir = join('/tmp', `patchwright-full-${process.pid}`);
	beforeAll(async () => {
		// a 64 kB tmpfs is a disk that fills up for real (CI runs as root, like its apt-get step)
		mkdirSync(mountDir, { recursive: true });
		execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=64k', 'tmpfs', mountDir]);
		server = await startServer({ env: { UPLOADS_DIR: mountDir } });
		const db = server.db();
		const { project, crew, outsider } = await makeCrew(db);
		pid = project.id;
		owner = (await signInCrew(server, crew, outsider)).owner;
		const t = makeType(db, pid, { m: channels(1) });
		fixtureId = makeFixture(db, { projectId: pid, number: 1, typeId: t.type.id, modeId: t.modeIds.m }).id;
	});
	afterAll(async () => {
		await server?.stop();
		execFileSync('umount', [mountDir]);
	});

	it('answers 507 insufficient-storage and leaves no partial file and no row', async () => {
		const big = Buffer.concat([PNG, Buffer.alloc(400 * 1024, 7)]);
		const res = await owner.fetch(`/api/projects/${pid}/fixtures/${fixtureId}/photos`, {
			method: 'POST',
			body: photoForm(big)
		});
		await expectJsonError(res, 507, 'insufficient-storage');
		expect(filesUnder(mountDir)).toEqual([]);
		expect(server.db().select().from(uploads).all()).toEqual([]);
		// a photo that fits still goes through
		const small = await owner.fetch(`/api/projects/${pid}/fixtures/${fixtureId}/photos`, {
			method: 'POST',
			body: photoForm(PNG)
		});
		expect(small.status).toBe(201);
	});
});
