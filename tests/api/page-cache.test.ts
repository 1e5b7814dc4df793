import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { memberships, projects } from '../../src/lib/server/db/schema';
import { addMember, makeProject, makeUser, PASSWORD } from '../helpers/factories';
import { startServer, type Client, type TestServer } from '../helpers/server';

// Rendered project pages are kept until the next write (src/lib/server/page-cache.ts, issue 14).
// What must never happen: a kept page older than the data, a kept page shown to another user, or
// a kept page outliving a removed membership or an ended session.

let server: TestServer;

beforeAll(async () => {
	server = await startServer();
});
afterAll(() => server?.stop());

async function crew() {
	const db = server.db();
	const programmer = await makeUser(db, { name: 'Pat Programmer' });
	const viewer = await makeUser(db, { name: 'Vic Viewer' });
	const project = makeProject(db, { name: 'Night Exterior' });
	addMember(db, project.id, programmer.id, 'programmer');
	addMember(db, project.id, viewer.id, 'viewer');
	return {
		db,
		project,
		programmer,
		viewer,
		asProgrammer: await server.signIn(programmer.email!, PASSWORD),
		asViewer: await server.signIn(viewer.email!, PASSWORD)
	};
}

const html = (client: Client, path: string, headers: Record<string, string> = {}) =>
	client.fetch(path, { headers: { accept: 'text/html', ...headers }, redirect: 'manual' });

describe('kept page renders', () => {
	it('a repeat of the same page is the same render, tagged, and revalidates to 304 while nothing is written', async () => {
		const { project, asProgrammer } = await crew();
		const path = `/projects/${project.id}/patch`;
		const first = await html(asProgrammer, path);
		expect(first.status).toBe(200);
		const tag = first.headers.get('etag');
		expect(tag).toMatch(/^"page-[\w-]+"$/);
		expect(first.headers.get('cache-control')).toBe('private, no-cache');
		const body = await first.text();
		const second = await html(asProgrammer, path);
		expect(second.headers.get('etag')).toBe(tag);
		expect(await second.text()).toBe(body);
		// RFC 9110 §13.1.2: If-None-Match naming the current tag answers 304 with no body
		const again = await html(asProgrammer, path, { 'if-none-match': tag! });
		expect(again.status).toBe(304);
		expect(await again.text()).toBe('');
	});

	it('a write through the API shows on the next request', async () => {
		const { project, asProgrammer } = await crew();
		const path = `/projects/${project.id}/patch`;
		const before = await html(asProgrammer, path);
		expect(await before.text()).toContain('Night Exterior');
		const renamed = await asProgrammer.patch(`/api/projects/${project.id}`, {
			version: project.version,
			name: 'Dawn Exterior'
		});
		expect(renamed.status).toBe(200);
		const after = await html(asProgrammer, path, { 'if-none-match': before.headers.get('etag')! });
		expect(after.status).toBe(200);
		expect(after.headers.get('etag')).not.toBe(before.headers.get('etag'));
		const text = await after.text();
		expect(text).toContain('Dawn Exterior');
		expect(text).not.toContain('Night Exterior');
	});

	it('a write by another connection to the database file shows on the next request', async () => {
		const { db, project, asProgrammer } = await crew();
		const path = `/projects/${project.id}`;
		expect(await (await html(asProgrammer, path)).text()).toContain('Night Exterior');
		db.update(projects).set({ name: 'Rain Exterior' }).where(eq(projects.id, project.id)).run();
		expect(await (await html(asProgrammer, path)).text()).toContain('Rain Exterior');
	});

	it('each user gets their own render of the same page', async () => {
		const { project, asProgrammer, asViewer } = await crew();
		const path = `/projects/${project.id}/patch`;
		const mine = await html(asProgrammer, path);
		const theirs = await html(asViewer, path);
		expect(mine.headers.get('etag')).not.toBe(theirs.headers.get('etag'));
		const viewerText = await theirs.text();
		expect(viewerText).toContain('Vic Viewer');
		expect(viewerText).not.toContain('Pat Programmer');
	});

	it('a removed member is refused at once, even with the page kept', async () => {
		const { db, project, programmer, asProgrammer } = await crew();
		const path = `/projects/${project.id}/universes`;
		expect((await html(asProgrammer, path)).status).toBe(200);
		expect((await html(asProgrammer, path)).status).toBe(200);
		db.delete(memberships)
			.where(and(eq(memberships.projectId, project.id), eq(memberships.userId, programmer.id)))
			.run();
		expect((await html(asProgrammer, path)).status).toBe(404);
	});

	it('the role kept for read-only requests goes with the membership, at once', async () => {
		const { db, project, programmer, asProgrammer } = await crew();
		const path = `/api/projects/${project.id}/conflicts`;
		expect((await asProgrammer.get(path)).status).toBe(200);
		expect((await asProgrammer.get(path)).status).toBe(200);
		// by another connection (data_version), then by the server itself (its own write counter)
		db.update(memberships)
			.set({ role: 'viewer' })
			.where(and(eq(memberships.projectId, project.id), eq(memberships.userId, programmer.id)))
			.run();
		const renamed = await asProgrammer.patch(`/api/projects/${project.id}`, { version: project.version, name: 'No' });
		expect(renamed.status).toBe(403);
		db.delete(memberships)
			.where(and(eq(memberships.projectId, project.id), eq(memberships.userId, programmer.id)))
			.run();
		expect((await asProgrammer.get(path)).status).toBe(404);
	});

	it('a signed-out cookie gets no kept page', async () => {
		const { project, asProgrammer } = await crew();
		const path = `/projects/${project.id}/patch`;
		const cookie = [...asProgrammer.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
		expect((await html(asProgrammer, path)).status).toBe(200);
		expect((await asProgrammer.form('/auth/signout', { callbackUrl: '/signin' })).status).toBe(302);
		const res = await fetch(`${server.url}${path}`, { headers: { cookie, accept: 'text/html' }, redirect: 'manual' });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toContain('/signin');
	});

	it('the theme cookie picks its own render', async () => {
		const { project, asProgrammer } = await crew();
		const path = `/projects/${project.id}/patch`;
		const plain = await (await html(asProgrammer, path)).text();
		expect(plain).not.toContain('data-theme="dark"');
		asProgrammer.cookies.set('pw-theme', 'dark');
		expect(await (await html(asProgrammer, path)).text()).toContain('data-theme="dark"');
		asProgrammer.cookies.delete('pw-theme');
		expect(await (await html(asProgrammer, path)).text()).not.toContain('data-theme="dark"');
	});
});
