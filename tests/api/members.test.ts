import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { makeCrew, makeUser, PASSWORD, uniqueEmail } from '../helpers/factories';

let server: TestServer;
let crew: Awaited<ReturnType<typeof makeCrew>>;

beforeAll(async () => {
	server = await startServer();
	crew = await makeCrew(server.db());
});
afterAll(() => server?.stop());

const as = (who: 'owner' | 'programmer' | 'electrician' | 'viewer' | 'outsider') =>
	server.signIn(who === 'outsider' ? crew.outsider.email : crew.crew[who].email, PASSWORD);

async function caughtMail(to: string) {
	for (let i = 0; i < 50; i++) {
		const mails = (await (await fetch(`${server.url}/dev/mail.json`)).json()) as {
			to: string;
			subject: string;
			text: string;
		}[];
		const mail = mails.find((m) => m.to.includes(to));
		if (mail) return mail;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail to ${to}`);
}

describe('requireRole on project routes', () => {
	it('answers 401 to nobody, 404 to a non-member (as if the project did not exist), 200 to members', async () => {
		const path = `/api/projects/${crew.project.id}`;
		const anonymous = await server.anonymous().get(path);
		expect(anonymous.status).toBe(401);
		expect((await anonymous.json()).error.code).toBe('unauthenticated');

		const outsider = await (await as('outsider')).get(path);
		expect(outsider.status).toBe(404);
		const missing = await (await as('outsider')).get('/api/projects/999999');
		expect(missing.status).toBe(404);
		expect(await outsider.json()).toEqual(await missing.json());

		for (const role of ['owner', 'programmer', 'electrician', 'viewer'] as const) {
			const res = await (await as(role)).get(path);
			expect(res.status).toBe(200);
			expect((await res.json()).role).toBe(role);
		}
	});

	it('answers 403 when the role is too low, and writes nothing', async () => {
		const viewer = await as('viewer');
		const res = await viewer.patch(`/api/projects/${crew.project.id}`, { name: 'Renamed', version: 1 });
		expect(res.status).toBe(403);
		const body = await res.json();
		expect(body.error.code).toBe('forbidden');
		expect(body.error.message).toContain('programmer');
		const electrician = await as('electrician');
		expect((await electrician.delete(`/api/projects/${crew.project.id}`)).status).toBe(403);
		const after = await (await as('owner')).get(`/api/projects/${crew.project.id}`);
		expect((await after.json()).name).toBe(crew.project.name);
	});

	it('a project page sends the signed-out to sign in and back, and refuses a non-member with 404', async () => {
		const signedOut = await server.anonymous().get(`/projects/${crew.project.id}/fixtures/7?from=label`);
		expect(signedOut.status).toBe(303);
		expect(signedOut.headers.get('location')).toBe(
			`/signin?callbackUrl=${encodeURIComponent(`/projects/${crew.project.id}/fixtures/7?from=label`)}`
		);
		expect((await (await as('outsider')).get(`/projects/${crew.project.id}`)).status).toBe(404);
		expect((await (await as('viewer')).get(`/projects/${crew.project.id}`)).status).toBe(200);
	});
});

describe('projects', () => {
	it('creating a project makes you its owner; bad input is 400 with issues and writes nothing', async () => {
		const client = await as('outsider');
		const bad = await client.post('/api/projects', { name: '', surprise: true });
		expect(bad.status).toBe(400);
		const issues = (await bad.json()).error.issues as { path: string[] }[];
		expect(issues.map((i) => i.path[0])).toEqual(expect.arrayContaining(['name']));
		expect((await (await client.get('/api/projects')).json()).projects).toHaveLength(0);

		const res = await client.post('/api/projects', { name: 'Car rig, night 2', venue: 'Ring road' });
		expect(res.status).toBe(201);
		const project = await res.json();
		expect(project).toMatchObject({ name: 'Car rig, night 2', role: 'owner', version: 1 });
		const members = (await (await client.get(`/api/projects/${project.id}/members`)).json()).members;
		expect(members).toEqual([expect.objectContaining({ email: crew.outsider.email, role: 'owner' })]);
	});

	it('a stale version answers 409 with the current project', async () => {
		const owner = await as('owner');
		const path = `/api/projects/${crew.project.id}`;
		const first = await owner.patch(path, { venue: 'Pier 4', version: 1 });
		expect(first.status).toBe(200);
		expect((await first.json()).version).toBe(2);
		const stale = await owner.patch(path, { venue: 'Pier 5', version: 1 });
		expect(stale.status).toBe(409);
		const body = await stale.json();
		expect(body.error.code).toBe('stale');
		expect(body.current).toMatchObject({ venue: 'Pier 4', version: 2 });
	});
});

describe('members and invitations', () => {
	it('an owner adding an existing account sends it an invitation (never joins it at once); a programmer may not', async () => {
		const someone = await makeUser(server.db());
		const programmer = await as('programmer');
		expect(
			(await programmer.post(`/api/projects/${crew.project.id}/members`, { email: someone.email, role: 'viewer' }))
				.status
		).toBe(403);
		const owner = await as('owner');
		const res = await owner.post(`/api/projects/${crew.project.id}/members`, {
			email: someone.email,
			role: 'electrician'
		});
		expect(res.status).toBe(201);
		expect(await res.json()).toMatchObject({ status: 'invited', role: 'electrician' });
		const joined = await server.signIn(someone.email!, PASSWORD);
		expect((await joined.get(`/api/projects/${crew.project.id}`)).status).toBe(404);
		const link = (await caughtMail(someone.email!)).text.match(/https?:\/\/\S+\/invite\/\S+/)?.[0];
		expect((await joined.form(new URL(link!).pathname, {})).status).toBe(303);
		expect((await joined.get(`/api/projects/${crew.project.id}`)).status).toBe(200);
	});

	it('an owner invites a new address by e-mail; the link, opened by that account, joins the project', async () => {
		const email = uniqueEmail('newhand');
		const owner = await as('owner');
		const res = await owner.post(`/api/projects/${crew.project.id}/members`, { email, role: 'programmer' });
		expect(res.status).toBe(201);
		expect(await res.json()).toMatchObject({ status: 'invited', email, mailed: true });
		const mail = await caughtMail(email);
		expect(mail.text).toContain(crew.project.name);
		const link = mail.text.match(/https?:\/\/\S+\/invite\/\S+/)?.[0];
		expect(link).toBeDefined();

		// someone else signed in cannot use it
		const wrong = await as('viewer');
		const refused = await wrong.form(new URL(link!).pathname, {});
		expect(refused.status).toBe(403);

		const invitee = await makeUser(server.db(), { email });
		const client = await server.signIn(invitee.email!, PASSWORD);
		const accepted = await client.form(new URL(link!).pathname, {});
		expect(accepted.status).toBe(303);
		expect(accepted.headers.get('location')).toBe(`/projects/${crew.project.id}`);
		const me = await client.get(`/api/projects/${crew.project.id}`);
		expect((await me.json()).role).toBe('programmer');
		// used once only
		expect((await client.form(new URL(link!).pathname, {})).status).toBe(410);
	});

	it('the last owner cannot be demoted or removed', async () => {
		const owner = await as('owner');
		const path = `/api/projects/${crew.project.id}/members/${crew.crew.owner.id}`;
		const demote = await owner.patch(path, { role: 'viewer' });
		expect(demote.status).toBe(409);
		expect((await demote.json()).error.code).toBe('last-owner');
		expect((await owner.delete(path)).status).toBe(409);
		const res = await owner.patch(`/api/projects/${crew.project.id}/members/${crew.crew.viewer.id}`, {
			role: 'electrician'
		});
		expect(res.status).toBe(200);
		expect((await res.json()).role).toBe('electrician');
		await owner.patch(`/api/projects/${crew.project.id}/members/${crew.crew.viewer.id}`, { role: 'viewer' });
	});
});
