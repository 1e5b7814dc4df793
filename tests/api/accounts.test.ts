import { and, eq } from 'drizzle-orm';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { Client, startServer, type TestServer } from '../helpers/server';
import { makeCrew, makeUser, PASSWORD, uniqueEmail } from '../helpers/factories';
import { auditLog, invitations, projects, users } from '../../src/lib/server/db/schema';

// Issue 12, one test per hole (each failed on the code before the fix). Server A: the usual test
// settings. Server B: real throttle limits (scale 1) and a clock the test moves (PATCHWRIGHT_CLOCK_FILE).

interface Mail {
	to: string;
	subject: string;
	text: string;
	html: string;
}

let a: TestServer;
let b: TestServer;
let clockB: string;
let offsetB = 0;

function advance(ms: number) {
	offsetB += ms;
	writeFileSync(clockB, String(offsetB));
}

beforeAll(async () => {
	a = await startServer();
	const dir = (await import('node:fs')).mkdtempSync(join((await import('node:os')).tmpdir(), 'pw-clock-'));
	clockB = join(dir, 'clock');
	writeFileSync(clockB, '0');
	b = await startServer({ env: { PATCHWRIGHT_RATE_SCALE: '1', PATCHWRIGHT_CLOCK_FILE: clockB } });
}, 120_000);
afterAll(async () => {
	await a?.stop();
	await b?.stop();
});
// every test on B starts in a fresh throttle window (the per-client sign-in limit is per minute)
beforeEach(() => {
	if (clockB) advance(2 * 3_600_000);
});

async function mails(server: TestServer): Promise<Mail[]> {
	return (await (await fetch(`${server.url}/dev/mail.json`)).json()) as Mail[];
}

async function mailTo(server: TestServer, to: string, match: (m: Mail) => boolean = () => true): Promise<Mail> {
	for (let i = 0; i < 80; i++) {
		const found = (await mails(server)).find((m) => m.to.includes(to) && match(m));
		if (found) return found;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail to ${to}`);
}

function linkIn(mail: Mail, path: string): string {
	const link = mail.text.match(new RegExp(`https?://\\S+${path}\\S+`))?.[0];
	if (!link) throw new Error(`no ${path} link in: ${mail.text}`);
	return new URL(link).pathname;
}

async function signInFails(server: TestServer, email: string, password: string): Promise<string> {
	const res = await server.anonymous().form('/auth/callback/credentials', { email, password, callbackUrl: '/' });
	return res.headers.get('location') ?? '';
}

/** A copy of a client's cookies: the "stolen" cookie that must stop working. */
function copy(client: Client): Client {
	const clone = new Client(client.base);
	clone.cookies = new Map(client.cookies);
	return clone;
}

describe('hole 1: account takeover through /signup', () => {
	it('sign-up with the address of a link-only account leaves it untouched, and mails its owner instead', async () => {
		const victim = await makeUser(a.db(), { email: uniqueEmail('linkonly') });
		a.db().update(users).set({ passwordHash: null }).where(eq(users.id, victim.id)).run();
		const res = await a.anonymous().form('/signup', {
			name: 'Attacker',
			email: victim.email!,
			password: 'attacker chosen passphrase'
		});
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toMatch(/^\/signin\/check-email\?why=signup/);
		expect(a.db().select().from(users).where(eq(users.id, victim.id)).get()).toMatchObject({
			passwordHash: null,
			name: victim.name
		});
		expect(await signInFails(a, victim.email!, 'attacker chosen passphrase')).toContain('error=CredentialsSignin');
		const mail = await mailTo(a, victim.email!);
		expect(mail.subject).toBe('Set your Patchwright password');
		expect(mail.text).toContain('you already have one');
	});

	it('sign-up answers the same for a known and an unknown address; the mailed link makes the account', async () => {
		const known = await makeUser(a.db());
		const fresh = uniqueEmail('fresh');
		const answer = async (email: string) => {
			const res = await a.anonymous().form('/signup', { name: 'Someone', email, password: 'quiet lantern harbour' });
			return [res.status, (res.headers.get('location') ?? '').replace(encodeURIComponent(email), 'E')];
		};
		expect(await answer(known.email!)).toEqual(await answer(fresh));
		// nothing exists until the mailbox is proven
		expect(a.db().select().from(users).where(eq(users.email, fresh)).get()).toBeUndefined();
		expect(await signInFails(a, fresh, 'quiet lantern harbour')).toContain('error=CredentialsSignin');

		const path = linkIn(await mailTo(a, fresh), '/signup/confirm/');
		const client = a.anonymous();
		expect((await client.get(path)).status).toBe(200);
		const confirmed = await client.form(path, {});
		expect(confirmed.status).toBe(303);
		expect(confirmed.headers.get('location')).toContain('/signin?confirmed=1');
		expect(a.db().select().from(users).where(eq(users.email, fresh)).get()?.emailVerified).toBeTruthy();
		const signedIn = await a.signIn(fresh, 'quiet lantern harbour');
		expect((await signedIn.session())?.user?.email).toBe(fresh);
		// single use
		expect((await client.form(path, {})).status).toBe(400);
	});

	it('a password is set only through the link mailed to the address, which ends existing sessions', async () => {
		const user = await makeUser(a.db());
		const before = await a.signIn(user.email!, PASSWORD);
		const req = await a.anonymous().form('/account/password', { email: user.email! });
		expect(req.headers.get('location')).toMatch(/^\/signin\/check-email\?why=password/);
		const path = linkIn(await mailTo(a, user.email!, (m) => m.text.includes('new password')), '/account/password/');
		const set = await a.anonymous().form(path, { password: 'brand new river stones' });
		expect(set.status).toBe(303);
		expect((await before.get('/api/projects')).status).toBe(401);
		expect((await a.signIn(user.email!, 'brand new river stones')).cookies.size).toBeGreaterThan(0);
		expect((await a.anonymous().form(path, { password: 'another one entirely' })).status).toBe(400);
	});
});

describe('hole 2: unverified addresses never join', () => {
	it('an owner adding a squatted address sends an invitation; the squatter is not a member and cannot accept', async () => {
		const { project, crew } = await makeCrew(a.db());
		const target = uniqueEmail('realperson');
		const squatter = await makeUser(a.db(), { email: target, verified: false });
		const owner = await a.signIn(crew.owner.email, PASSWORD);
		const res = await owner.post(`/api/projects/${project.id}/members`, { email: target, role: 'programmer' });
		expect(res.status).toBe(201);
		expect((await res.json()).status).toBe('invited');
		const asSquatter = await a.signIn(squatter.email!, PASSWORD);
		expect((await asSquatter.get(`/api/projects/${project.id}`)).status).toBe(404);
		// even holding the mailed link, an account that never proved the mailbox is refused
		const path = linkIn(await mailTo(a, target), '/invite/');
		const refused = await asSquatter.form(path, {});
		expect(refused.status).toBe(403);
		expect((await asSquatter.get(`/api/projects/${project.id}`)).status).toBe(404);
	});
});

describe('hole 3: redirects stay on this site', () => {
	it.each([
		'/%5Cevil.example/x',
		'/%09/evil.example',
		'//evil.example',
		'https://evil.example/',
		'/.//evil.example',
		'/%0D%0ASet-Cookie:%20x=1',
		'/caf%C3%A9',
		'javascript:alert(1)'
	])('a signed-in GET /signin?callbackUrl=%s lands on /', async (value) => {
		const client = await a.signIn((await makeUser(a.db())).email!, PASSWORD);
		const res = await client.get(`/signin?callbackUrl=${value}`);
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/');
	});

	it('a same-site path is kept', async () => {
		const client = await a.signIn((await makeUser(a.db())).email!, PASSWORD);
		const res = await client.get(`/signin?callbackUrl=${encodeURIComponent('/projects/3/fixtures/7?from=label')}`);
		expect(res.headers.get('location')).toBe('/projects/3/fixtures/7?from=label');
	});

	it("Auth.js's own callbackUrl after sign-in stays on this site", async () => {
		const user = await makeUser(a.db());
		const res = await a.anonymous().form('/auth/callback/credentials', {
			email: user.email!,
			password: PASSWORD,
			callbackUrl: '/\\evil.example/x'
		});
		expect(res.status).toBe(302);
		expect(new URL(res.headers.get('location')!).origin).toBe(a.url);
		expect(res.headers.get('location')).toBe(`${a.url}/`);
	});
});

describe('hole 4: sessions the server can end', () => {
	it('the old cookie is refused after sign-out, even with the session cache warm', async () => {
		const user = await makeUser(a.db());
		const client = await a.signIn(user.email!, PASSWORD);
		const stolen = copy(client);
		expect((await stolen.get('/api/projects')).status).toBe(200);
		expect((await client.form('/auth/signout', { callbackUrl: '/signin' })).status).toBe(302);
		expect((await stolen.get('/api/projects')).status).toBe(401);
		expect((await stolen.session())?.user).toBeUndefined();
	});

	it('"sign out everywhere" ends every session of the account at once, and only that account', async () => {
		const user = await makeUser(a.db());
		const other = await makeUser(a.db());
		const phone = await a.signIn(user.email!, PASSWORD);
		const desk = await a.signIn(user.email!, PASSWORD);
		const bystander = await a.signIn(other.email!, PASSWORD);
		expect((await phone.get('/api/projects')).status).toBe(200);
		const res = await desk.form('/account?/signOutEverywhere', {});
		expect(res.status).toBe(303);
		expect((await phone.get('/api/projects')).status).toBe(401);
		expect((await desk.get('/api/projects')).status).toBe(401);
		expect((await bystander.get('/api/projects')).status).toBe(200);
		// signing in again works
		expect((await (await a.signIn(user.email!, PASSWORD)).get('/api/projects')).status).toBe(200);
	});

	it('changing the password and deleting the account end the sessions', async () => {
		const user = await makeUser(a.db());
		const client = await a.signIn(user.email!, PASSWORD);
		const stolen = copy(client);
		const changed = await client.form('/account?/password', { current: PASSWORD, password: 'orchard quiet signal' });
		expect(changed.status).toBe(303);
		expect((await stolen.get('/api/projects')).status).toBe(401);

		const again = await a.signIn(user.email!, 'orchard quiet signal');
		const stolenAgain = copy(again);
		const deleted = await again.form('/account?/delete', { confirm: user.email! });
		expect(deleted.status).toBe(303);
		expect((await stolenAgain.get('/api/projects')).status).toBe(401);
		expect(a.db().select().from(users).where(eq(users.id, user.id)).get()).toBeUndefined();
	});

	it('an account that alone owns a project cannot be deleted; the answer names the project', async () => {
		const { project, crew } = await makeCrew(a.db());
		const owner = await a.signIn(crew.owner.email, PASSWORD);
		const res = await owner.fetch('/account?/delete', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-sveltekit-action': 'true' },
			body: new URLSearchParams({ confirm: crew.owner.email })
		});
		const body = await res.json();
		expect(body.status).toBe(409);
		expect(body.data).toContain(project.name);
		expect((await owner.get('/api/projects')).status).toBe(200);
	});
});

describe('hole 5: no mail relay', () => {
	it('the sign-in links for one address are throttled: the 41st request inside the window is refused', async () => {
		const email = uniqueEmail('flooded');
		const statuses: number[] = [];
		for (let i = 0; i < 41; i++) {
			const res = await b.anonymous().fetch('/auth/signin/nodemailer', {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'application/json' },
				body: new URLSearchParams({ email, callbackUrl: '/' }).toString()
			});
			statuses.push(res.status);
			if (res.status === 429) {
				const body = await res.json();
				expect(body.error.message).toMatch(/try again in \d+ minutes?/);
			}
		}
		expect(statuses[40]).toBe(429);
		await new Promise((r) => setTimeout(r, 500));
		const sent = (await mails(b)).filter((m) => m.to.includes(email));
		expect(sent.length).toBeLessThanOrEqual(5);
		expect(sent.length).toBeGreaterThan(0);
	});

	it('invitations are throttled per address, with the wait named, and nothing is written when refused', async () => {
		const { project, crew } = await makeCrew(b.db());
		const owner = await b.signIn(crew.owner.email, PASSWORD);
		const email = uniqueEmail('pestered');
		let last: Response | undefined;
		for (let i = 0; i < 6; i++) {
			last = await owner.post(`/api/projects/${project.id}/members`, { email, role: 'viewer' });
		}
		expect(last!.status).toBe(429);
		// each accepted call renewed the one pending invitation (5 audited invites); the refused sixth wrote nothing
		expect(b.db().select().from(invitations).where(eq(invitations.email, email)).all()).toHaveLength(1);
		const audited = b
			.db()
			.select()
			.from(auditLog)
			.where(and(eq(auditLog.projectId, project.id), eq(auditLog.action, 'member.invite')))
			.all();
		expect(audited).toHaveLength(5);
		const body = await last!.json();
		expect(body.error.message).toMatch(/Too many invitations — try again in \d+ minutes?/);
		expect(body.retryAfter).toBeGreaterThan(0);
	});

	it('a project name chosen by the sender is marked as their words and kept out of the subject', async () => {
		const { project, crew } = await makeCrew(a.db());
		const bait = 'Your account is locked, log in at http://evil.example now';
		a.db().update(projects).set({ name: bait }).where(eq(projects.id, project.id)).run();
		const owner = await a.signIn(crew.owner.email, PASSWORD);
		const email = uniqueEmail('invitee');
		expect((await owner.post(`/api/projects/${project.id}/members`, { email, role: 'viewer' })).status).toBe(201);
		const mail = await mailTo(a, email);
		expect(mail.subject).not.toContain('evil.example');
		expect(mail.text).toContain(`Project name (written by the sender, not by Patchwright): “${bait}”`);
		expect(mail.text).toContain(crew.owner.email);
	});
});

describe('hole 7: no enumeration, no lock-out of the rightful owner', () => {
	it('after ten wrong passwords the answer says to wait, and the right password works once the window passes', async () => {
		const user = await makeUser(b.db());
		for (let i = 0; i < 10; i++) {
			expect(await signInFails(b, user.email!, `wrong guess ${i}`)).toContain('error=CredentialsSignin');
		}
		const during = await signInFails(b, user.email!, PASSWORD);
		expect(during).toMatch(/code=too-many-\d+/);
		const page = await b.anonymous().get(new URL(during).pathname + new URL(during).search);
		expect(await page.text()).toMatch(/Too many attempts for this account — try again in \d+ minutes?\./);
		advance(16 * 60_000);
		const client = await b.signIn(user.email!, PASSWORD);
		expect((await client.get('/api/projects')).status).toBe(200);
	}, 120_000);

	it('an unknown address gets the same answer as a wrong password', async () => {
		const user = await makeUser(b.db());
		const known = await signInFails(b, user.email!, 'not the password at all');
		const unknown = await signInFails(b, uniqueEmail('nobody'), 'not the password at all');
		expect(unknown).toBe(known);
	});

	it('common and short passwords are refused at sign-up', async () => {
		for (const password of ['aaaaaaaaaa', 'password123', 'short']) {
			const res = await a.anonymous().fetch('/signup', {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-sveltekit-action': 'true' },
				body: new URLSearchParams({ name: 'X', email: uniqueEmail('weak'), password })
			});
			const body = await res.json();
			expect(body.type).toBe('failure');
			expect(body.status).toBe(400);
		}
	});
});
