import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { channels, makeFixture, makeReceiver, makeType } from '../helpers/patch-factories';
import { startServer, type Client, type TestServer } from '../helpers/server';
import { fixtures, uploads } from '../../src/lib/server/db/schema';

// Fixture photos (type from magic bytes, 10 MB limit, members only) and RC channel
// assignment through the receiver's assign route.

let server: TestServer;
let pid: number;
let fixtureId: number;
let as: Awaited<ReturnType<typeof signInCrew>>;

beforeAll(async () => {
	server = await startServer();
	const db = server.db();
	const { project, crew, outsider } = await makeCrew(db);
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
	const t = makeType(db, pid, { m: channels(1) });
	fixtureId = makeFixture(db, { projectId: pid, number: 1, typeId: t.type.id, modeId: t.modeIds.m }).id;
});
afterAll(() => server?.stop());

const photos = () => `/api/projects/${pid}/fixtures/${fixtureId}/photos`;
// PNG signature (ISO/IEC 15948), JPEG SOI + marker (ITU T.81), RIFF…WEBP container (RFC 9649)
const PNG = Buffer.from('89504e470d0a1a0a0000000d4948445200000001', 'hex');
const JPEG = Buffer.from('ffd8ffe000104a464946000101', 'hex');
const WEBP = Buffer.concat([Buffer.from('RIFF'), Buffer.from([4, 0, 0, 0]), Buffer.from('WEBPVP8 ')]);

function upload(client: Client, bytes: Uint8Array, name: string, declared = 'image/png') {
	const form = new FormData();
	form.append('file', new Blob([new Uint8Array(bytes)], { type: declared }), name);
	return client.fetch(photos(), { method: 'POST', body: form });
}

describe('photos', () => {
	it.each([
		['PNG', PNG, 'image/png'],
		['JPEG', JPEG, 'image/jpeg'],
		['WebP', WEBP, 'image/webp']
	])('an electrician uploads a %s; members read the bytes back, private', async (_, bytes, mime) => {
		const res = await upload(as.electrician, bytes, 'photo.bin', 'application/octet-stream');
		expect(res.status).toBe(201);
		const p = await res.json();
		expect(p.mime).toBe(mime);
		const got = await as.viewer.get(p.url);
		expect(got.status).toBe(200);
		expect(got.headers.get('content-type')).toBe(mime);
		expect(got.headers.get('cache-control')).toContain('private');
		expect(Buffer.from(await got.arrayBuffer()).equals(bytes)).toBe(true);
		expect((await as.outsider.get(p.url)).status).toBe(404);
		expect((await server.anonymous().get(p.url)).status).toBe(401);
		const stored = server.db().select().from(uploads).where(eq(uploads.id, p.id)).get()!;
		expect(stored.storedName).not.toContain('photo');
		expect(existsSync(join(server.uploadsDir, stored.storedName))).toBe(true);
	});

	it('a file that is not an image is 415 whatever its name or declared type, and nothing is stored', async () => {
		const before = existsSync(server.uploadsDir) ? readdirSync(server.uploadsDir).length : 0;
		const res = await upload(as.electrician, Buffer.from('GIF89a not ours'), 'photo.png', 'image/png');
		expect(res.status).toBe(415);
		expect((await res.json()).error.code).toBe('unsupported-type');
		expect(existsSync(server.uploadsDir) ? readdirSync(server.uploadsDir).length : 0).toBe(before);
		const json = await as.electrician.post(photos(), { file: 'x' });
		expect(json.status).toBe(415);
	});

	it('over 10 MB is 413', async () => {
		const big = Buffer.concat([PNG, Buffer.alloc(10 * 1024 * 1024)]);
		const res = await upload(as.electrician, big, 'big.png');
		expect(res.status).toBe(413);
	});

	it('lists photos; viewers cannot add or delete; electricians delete (file removed too)', async () => {
		const p = await (await upload(as.electrician, PNG, 'a.png')).json();
		const list = await (await as.viewer.get(photos())).json();
		expect(list.photos.map((x: { id: number }) => x.id)).toContain(p.id);
		expect((await upload(as.viewer, PNG, 'a.png')).status).toBe(403);
		expect((await as.viewer.delete(`${photos()}/${p.id}`)).status).toBe(403);
		const stored = server.db().select().from(uploads).where(eq(uploads.id, p.id)).get()!;
		expect((await as.electrician.delete(`${photos()}/${p.id}`)).status).toBe(204);
		expect(existsSync(join(server.uploadsDir, stored.storedName))).toBe(false);
		expect((await as.viewer.get(`${photos()}/${p.id}`)).status).toBe(404);
	});
});

describe('RC assignment', () => {
	it('assigns adjacent channels per fixture; a link group shares one block; apply:false previews', async () => {
		const db = server.db();
		const r = makeReceiver(db, pid, 'sbus', 'Car rig');
		const t = makeType(db, pid, {
			ihs: [
				{ offset: 1, parameter: 'intensity' },
				{ offset: 2, parameter: 'hue' },
				{ offset: 3, parameter: 'saturation' }
			]
		});
		const mk = (number: number, linkGroup: string | null) =>
			makeFixture(db, {
				projectId: pid,
				number,
				typeId: t.type.id,
				modeId: t.modeIds.ihs,
				linkGroup,
				controlKind: 'rc',
				receiverId: r.id,
				rcChannels: {}
			});
		const [a, b, c] = [mk(11, null), mk(12, 'pair'), mk(13, 'pair')];
		const preview = await as.programmer.post(`/api/projects/${pid}/receivers/${r.id}/assign`, { apply: false });
		expect(preview.status).toBe(200);
		const p = await preview.json();
		const of = (id: number) =>
			p.assigned.filter((x: { fixtureId: number }) => x.fixtureId === id).map((x: { channel: number }) => x.channel);
		expect(of(a.id)).toEqual([1, 2, 3]);
		expect(of(b.id)).toEqual([4, 5, 6]);
		expect(of(c.id)).toEqual([4, 5, 6]);
		expect(db.select().from(fixtures).where(eq(fixtures.id, a.id)).get()!.rcChannels).toEqual({});
		const applied = await as.programmer.post(`/api/projects/${pid}/receivers/${r.id}/assign`);
		expect((await applied.json()).applied).toBe(true);
		expect(db.select().from(fixtures).where(eq(fixtures.id, c.id)).get()).toMatchObject({
			rcChannels: { intensity: 4, hue: 5, saturation: 6 },
			version: 2
		});
		expect((await as.electrician.post(`/api/projects/${pid}/receivers/${r.id}/assign`)).status).toBe(403);
	});

	it('when the receiver runs out, assign reports unassigned with a reason and the conflicts list flags them', async () => {
		const db = server.db();
		// PPM carries 8 channels (common practice): three 3-parameter fixtures need 9
		const r = makeReceiver(db, pid, 'ppm', 'Balloon');
		const t = makeType(db, pid, {
			ihs: [
				{ offset: 1, parameter: 'intensity' },
				{ offset: 2, parameter: 'hue' },
				{ offset: 3, parameter: 'saturation' }
			]
		});
		const ids = [21, 22, 23].map(
			(n) =>
				makeFixture(db, {
					projectId: pid,
					number: n,
					typeId: t.type.id,
					modeId: t.modeIds.ihs,
					controlKind: 'rc',
					receiverId: r.id,
					rcChannels: {}
				}).id
		);
		const res = await (await as.programmer.post(`/api/projects/${pid}/receivers/${r.id}/assign`, {})).json();
		expect(res.assigned.filter((x: { fixtureId: number }) => x.fixtureId === ids[2])).toEqual([]);
		expect(res.unassigned).toHaveLength(3);
		expect(res.unassigned[0]).toMatchObject({ fixtureId: ids[2], parameter: 'intensity' });
		expect(res.unassigned[0].reason).toContain('needs 3 adjacent free channels');
		const conflicts = (await (await as.viewer.get(`/api/projects/${pid}/conflicts`)).json()).conflicts as {
			kind: string;
			fixtureIds: number[];
		}[];
		expect(conflicts.some((c) => c.kind === 'rc-unassigned' && c.fixtureIds.includes(ids[2]))).toBe(true);
	});

	it('fixtureIds limits the pass to those fixtures; others keep their channels', async () => {
		const db = server.db();
		const r = makeReceiver(db, pid, 'crsf', 'Drone');
		const t = makeType(db, pid, { i: [{ offset: 1, parameter: 'intensity' }] });
		const kept = makeFixture(db, {
			projectId: pid,
			number: 31,
			typeId: t.type.id,
			modeId: t.modeIds.i,
			controlKind: 'rc',
			receiverId: r.id,
			rcChannels: { intensity: 1 }
		});
		const fresh = makeFixture(db, {
			projectId: pid,
			number: 32,
			typeId: t.type.id,
			modeId: t.modeIds.i,
			controlKind: 'rc',
			receiverId: r.id,
			rcChannels: { intensity: 1 }
		});
		const res = await (
			await as.programmer.post(`/api/projects/${pid}/receivers/${r.id}/assign`, { fixtureIds: [fresh.id] })
		).json();
		expect(res.assigned).toEqual([{ fixtureId: fresh.id, parameter: 'intensity', channel: 2 }]);
		expect(db.select().from(fixtures).where(eq(fixtures.id, kept.id)).get()).toMatchObject({
			rcChannels: { intensity: 1 },
			version: 1
		});
		const stray = await as.programmer.post(`/api/projects/${pid}/receivers/${r.id}/assign`, {
			fixtureIds: [fixtureId]
		});
		expect(stray.status).toBe(400);
	});
});
