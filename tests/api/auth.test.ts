import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { DEMO_USERS } from '../../src/lib/server/demo';

let server: TestServer;

beforeAll(async () => {
	server = await startServer({ demo: true });
});
afterAll(() => server?.stop());

describe('sign-in (Auth.js credentials)', () => {
	it.each(DEMO_USERS.map((u) => [u.role, u.email]))(
		'the demo %s signs in and sees the demo project',
		async (role, email) => {
			const client = await server.signIn(email);
			const session = await client.session();
			expect(session?.user?.email).toBe(email);
			const res = await client.get('/api/projects');
			expect(res.status).toBe(200);
			const { projects } = await res.json();
			expect(projects).toHaveLength(1);
			expect(projects[0].role).toBe(role);
		}
	);

	it('a wrong password is refused with a clear error and no session', async () => {
		const client = server.anonymous();
		const res = await client.form('/auth/callback/credentials', {
			email: 'owner@demo.test',
			password: 'not-the-password',
			callbackUrl: '/'
		});
		expect(res.status).toBe(302);
		const location = res.headers.get('location')!;
		expect(location).toContain('/signin?error=CredentialsSignin');
		expect(await client.session()).toBeNull();
		const page = await client.get(new URL(location).pathname + new URL(location).search);
		expect(await page.text()).toContain('Wrong e-mail or password.');
	});

	it('the session cookie is httpOnly and SameSite=Lax', async () => {
		const res = await server.anonymous().form('/auth/callback/credentials', {
			email: 'viewer@demo.test',
			password: 'patchwright-demo',
			callbackUrl: '/'
		});
		const cookie = res.headers.getSetCookie().find((c) => c.startsWith('authjs.session-token='));
		expect(cookie).toMatch(/HttpOnly/i);
		expect(cookie).toMatch(/SameSite=Lax/i);
	});

	it('a cross-origin form POST is refused before Auth.js sees it (SvelteKit origin check)', async () => {
		const res = await fetch(`${server.url}/auth/callback/credentials`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', origin: 'http://evil.example' },
			body: 'email=owner@demo.test&password=patchwright-demo',
			redirect: 'manual'
		});
		expect(res.status).toBe(403);
		expect(res.headers.getSetCookie().some((c) => c.startsWith('authjs.session-token='))).toBe(false);
	});

	it('signing out ends the session', async () => {
		const client = await server.signIn('programmer@demo.test');
		const res = await client.form('/auth/signout', { callbackUrl: '/signin' });
		expect(res.status).toBe(302);
		expect(await client.session()).toBeNull();
	});
});

describe('sign-up', () => {
	it('mails a confirmation link; the account exists (and signs in) only once the link is used', async () => {
		const client = server.anonymous();
		const res = await client.form('/signup', {
			name: 'New Gaffer',
			email: 'New.Gaffer@Example.test',
			password: 'a long enough password'
		});
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toContain('/signin/check-email?why=signup');
		await expect(server.signIn('new.gaffer@example.test', 'a long enough password')).rejects.toThrow();
		let link: string | undefined;
		for (let i = 0; i < 50 && !link; i++) {
			const mails = (await (await fetch(`${server.url}/dev/mail.json`)).json()) as { to: string; text: string }[];
			link = mails.find((m) => m.to.includes('new.gaffer@example.test'))?.text.match(/https?:\/\/\S+/)?.[0];
			if (!link) await new Promise((r) => setTimeout(r, 100));
		}
		expect(link).toContain('/signup/confirm/');
		expect((await client.form(new URL(link!).pathname, {})).status).toBe(303);
		const signedIn = await server.signIn('new.gaffer@example.test', 'a long enough password');
		expect((await signedIn.session())?.user?.email).toBe('new.gaffer@example.test');
	});

	it('refuses a short password keeping the form input, and never says whether an address is taken', async () => {
		const client = server.anonymous();
		const short = await client.fetch('/signup', {
			method: 'POST',
			headers: {
				'content-type': 'application/x-www-form-urlencoded',
				'x-sveltekit-action': 'true',
				accept: 'application/json'
			},
			body: new URLSearchParams({ name: 'A', email: 'a@example.test', password: 'short' })
		});
		const shortBody = await short.json();
		expect(shortBody.type).toBe('failure');
		expect(shortBody.status).toBe(400);
		expect(shortBody.data).toContain('Use at least 10 characters.');
		expect(shortBody.data).toContain('a@example.test');
		const taken = await client.form('/signup', {
			name: 'B',
			email: 'owner@demo.test',
			password: 'long enough password'
		});
		expect(taken.status).toBe(303);
		expect(taken.headers.get('location')).toContain('/signin/check-email?why=signup');
	});
});

describe('e-mailed sign-in link (nodemailer provider → local SMTP sink)', () => {
	it('sends a link the sink catches, and the link signs the user in', async () => {
		const client = server.anonymous();
		const res = await client.form('/auth/signin/nodemailer', { email: 'electrician@demo.test', callbackUrl: '/' });
		expect(res.status).toBe(302);
		expect(res.headers.get('location')).toContain('/auth/verify-request');
		const verify = await client.get(res.headers.get('location')!);
		expect(verify.headers.get('location')).toMatch(/^\/signin\/check-email/);

		let link: string | undefined;
		for (let i = 0; i < 50 && !link; i++) {
			const mails = (await (await fetch(`${server.url}/dev/mail.json`)).json()) as {
				to: string;
				subject: string;
				text: string;
				html: string;
			}[];
			const mail = mails.find((m) => m.to.includes('electrician@demo.test'));
			if (mail) {
				expect(mail.subject).toContain('sign-in link');
				expect(mail.html).toContain('<a href=');
				link = mail.text.match(/https?:\/\/\S+/)?.[0];
			}
			if (!link) await new Promise((r) => setTimeout(r, 100));
		}
		expect(link).toBeDefined();
		const callback = await client.get(link!);
		expect(callback.status).toBe(302);
		expect((await client.session())?.user?.email).toBe('electrician@demo.test');
	});
});
