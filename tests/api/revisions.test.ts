import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fixtures } from '../../src/lib/server/db/schema';
import { makeUser, PASSWORD } from '../helpers/factories';
import { demoProjectId, twoDmxFixtures, waitForMail } from '../helpers/revisions';
import { startServer, type Client, type TestServer } from '../helpers/server';

// Behaviour from DESIGN.md ("Revision", "Sign-off", "Roles", "JSON API").

let server: TestServer;
let pid: number;
let programmer: Client;
let viewer: Client;
let electrician: Client;
let outsider: Client;

beforeAll(async () => {
	server = await startServer({ demo: true });
	pid = demoProjectId(server.db());
	[programmer, viewer, electrician] = await Promise.all([
		server.signIn('programmer@demo.test'),
		server.signIn('viewer@demo.test'),
		server.signIn('electrician@demo.test')
	]);
	const stranger = await makeUser(server.db());
	outsider = await server.signIn(stranger.email!, PASSWORD);
});
afterAll(() => server?.stop());

describe('revisions', () => {
	it('roles: viewer and electrician may not make a revision (403), a non-member sees 404, nobody signed in 401 (DESIGN "Roles")', async () => {
		expect((await viewer.post(`/api/projects/${pid}/revisions`, { note: 'x' })).status).toBe(403);
		expect((await electrician.post(`/api/projects/${pid}/revisions`, { note: 'x' })).status).toBe(403);
		const res = await outsider.get(`/api/projects/${pid}/revisions`);
		expect(res.status).toBe(404);
		expect((await res.json()).error.code).toBe('not-found');
		expect((await outsider.post(`/api/projects/${pid}/revisions`, { note: 'x' })).status).toBe(404);
		expect((await server.anonymous().get(`/api/projects/${pid}/revisions`)).status).toBe(401);
		expect((await programmer.get(`/api/projects/${pid}/revisions`)).status).toBe(200);
	});

	it('bad input writes nothing: an unknown field is a 400 with issues', async () => {
		const res = await programmer.post(`/api/projects/${pid}/revisions`, { note: 'x', number: 7 });
		expect(res.status).toBe(400);
		expect((await res.json()).error.issues.length).toBeGreaterThan(0);
		expect((await (await programmer.get(`/api/projects/${pid}/revisions`)).json()).revisions).toHaveLength(0);
	});

	it('snapshots the whole patch with the next number, and later edits leave the snapshot alone', async () => {
		const db = server.db();
		const [a, b] = twoDmxFixtures(db, pid);
		const first = await programmer.post(`/api/projects/${pid}/revisions`, { note: 'Camera rehearsal' });
		expect(first.status).toBe(201);
		const created = await first.json();
		expect(created).toMatchObject({ number: 1, note: 'Camera rehearsal', author: 'Pim Programmer', signoffs: [] });

		const one = await (await viewer.get(`/api/projects/${pid}/revisions/1`)).json();
		expect(Object.keys(one.snapshot).sort()).toEqual(['fixtures', 'project', 'receivers', 'types', 'universes']);
		// the demo: 4 universes, 5 types, 46 fixtures, one receiver (src/lib/server/demo.ts)
		expect(one.snapshot.fixtures).toHaveLength(46);
		expect(one.snapshot.universes).toHaveLength(4);
		expect(one.snapshot.types).toHaveLength(5);
		expect(one.snapshot.receivers).toHaveLength(1);
		// computed: a dmx fixture occupies [address, address + footprint − 1] (DESIGN "Computation")
		const fa = one.patch.fixtures.find((f: { id: number }) => f.id === a.id);
		expect(fa.slots).toEqual([{ start: a.address, end: a.address! + fa.footprint - 1 }]);
		// the demo's deliberate overlap shows as a conflict in the revision's computed patch
		expect(one.patch.conflicts.some((c: { kind: string }) => c.kind === 'overlap')).toBe(true);

		// edit the live rows behind the API's back: rename a, re-address b
		db.update(fixtures)
			.set({ label: 'RENAMED KEY', version: a.version + 1 })
			.where(eq(fixtures.id, a.id))
			.run();
		db.update(fixtures).set({ address: 500 }).where(eq(fixtures.id, b.id)).run();

		const again = await (await viewer.get(`/api/projects/${pid}/revisions/1`)).json();
		expect(again.snapshot).toEqual(one.snapshot);
		expect(again.snapshot.fixtures.find((f: { id: number }) => f.id === a.id).label).toBe(a.label);
		const live = await (await viewer.get(`/api/projects/${pid}/patch`)).json();
		expect(live.fixtures.find((f: { id: number }) => f.id === a.id).label).toBe('RENAMED KEY');

		const second = await programmer.post(`/api/projects/${pid}/revisions`, { note: 'After the recce' });
		expect((await second.json()).number).toBe(2);
	});

	it('the diff names the renamed fixture and the re-addressed one, field by field', async () => {
		const [a, b] = twoDmxFixtures(server.db(), pid);
		const res = await viewer.get(`/api/projects/${pid}/revisions/2/diff?against=1`);
		expect(res.status).toBe(200);
		const diff = await res.json();
		expect(diff.before).toEqual({ revision: 1 });
		expect(diff.after).toEqual({ revision: 2 });
		expect(diff.added).toEqual([]);
		expect(diff.removed).toEqual([]);
		const byId = new Map(diff.changed.map((c: { fixtureId: number }) => [c.fixtureId, c]));
		expect(byId.get(a.id)).toMatchObject({
			number: a.number,
			label: 'RENAMED KEY',
			fields: [{ field: 'label', after: 'RENAMED KEY' }]
		});
		expect(byId.get(b.id)).toMatchObject({ number: b.number, fields: [{ field: 'control.address', after: 500 }] });
		expect(diff.changed).toHaveLength(2);
	});

	it('against=live compares the draft with a revision; a missing or unknown revision answers 400/404', async () => {
		const [a] = twoDmxFixtures(server.db(), pid);
		server.db().update(fixtures).set({ notes: 'gel changed' }).where(eq(fixtures.id, a.id)).run();
		const diff = await (await viewer.get(`/api/projects/${pid}/revisions/2/diff?against=live`)).json();
		expect(diff.after).toEqual({ revision: 'live' });
		expect(diff.changed).toEqual([
			{
				fixtureId: a.id,
				number: a.number,
				label: 'RENAMED KEY',
				fields: [{ field: 'notes', before: a.notes, after: 'gel changed' }]
			}
		]);
		expect((await viewer.get(`/api/projects/${pid}/revisions/2/diff`)).status).toBe(400);
		expect((await viewer.get(`/api/projects/${pid}/revisions/2/diff?against=9`)).status).toBe(404);
		expect((await viewer.get(`/api/projects/${pid}/revisions/9`)).status).toBe(404);
		expect((await viewer.get(`/api/projects/${pid}/revisions/abc`)).status).toBe(404);
	});

	it('revisions are never updated or deleted through the API', async () => {
		const del = await programmer.delete(`/api/projects/${pid}/revisions/1`);
		const patch = await programmer.patch(`/api/projects/${pid}/revisions/1`, { note: 'changed' });
		expect(del.status).toBe(405);
		expect(patch.status).toBe(405);
		expect((await (await viewer.get(`/api/projects/${pid}/revisions/1`)).json()).note).toBe('Camera rehearsal');
	});

	it('a member signs off; owners and programmers get one mail each; the approval goes stale once a later revision exists', async () => {
		const res = await viewer.post(`/api/projects/${pid}/revisions/2/signoffs`, {
			decision: 'approved',
			comment: 'Fine by me'
		});
		expect(res.status).toBe(201);
		expect(await res.json()).toMatchObject({
			decision: 'approved',
			name: 'Vera Viewer',
			comment: 'Fine by me',
			stale: false
		});

		const mails = await waitForMail(
			server,
			(m) => m.subject.includes('Revision 2 approved') && m.text.includes('Vera Viewer'),
			2
		);
		expect(mails.map((m) => m.to).sort()).toEqual(['owner@demo.test', 'programmer@demo.test']);
		for (const m of mails) {
			expect(m.text).toContain(`${server.url}/projects/${pid}/revisions`);
			expect(m.html).toContain(`${server.url}/projects/${pid}/revisions`);
			expect(m.text).toContain('Fine by me');
		}

		let list = (await (await viewer.get(`/api/projects/${pid}/revisions`)).json()).revisions;
		expect(list.map((r: { number: number }) => r.number)).toEqual([2, 1]);
		expect(list[0].signoffs).toEqual([
			expect.objectContaining({ decision: 'approved', name: 'Vera Viewer', stale: false })
		]);

		expect((await programmer.post(`/api/projects/${pid}/revisions`, { note: 'Night two' })).status).toBe(201);
		list = (await (await viewer.get(`/api/projects/${pid}/revisions`)).json()).revisions;
		expect(list[1].number).toBe(2);
		expect(list[1].signoffs[0].stale).toBe(true);
		expect((await (await viewer.get(`/api/projects/${pid}/revisions/2`)).json()).signoffs[0].stale).toBe(true);
	});

	it('a sign-off with a made-up decision is refused and stores nothing', async () => {
		const res = await viewer.post(`/api/projects/${pid}/revisions/3/signoffs`, { decision: 'maybe', comment: '' });
		expect(res.status).toBe(400);
		expect((await (await viewer.get(`/api/projects/${pid}/revisions/3`)).json()).signoffs).toEqual([]);
		expect(
			(await outsider.post(`/api/projects/${pid}/revisions/3/signoffs`, { decision: 'approved', comment: '' })).status
		).toBe(404);
	});
});
