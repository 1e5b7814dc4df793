import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { makeUser, PASSWORD } from '../helpers/factories';

let server: TestServer;

beforeAll(async () => {
	// real limits (scale 1) so the sign-in throttles can be seen
	server = await startServer({ env: { PATCHWRIGHT_RATE_SCALE: '1' } });
});
afterAll(() => server?.stop());

describe('headers', () => {
	it('pages carry a CSP without inline-script exceptions, and nosniff', async () => {
		const res = await fetch(`${server.url}/signin`);
		const csp = res.headers.get('content-security-policy') ?? '';
		const scriptSrc = csp.split(';').find((d) => d.trim().startsWith('script-src')) ?? '';
		expect(scriptSrc).toContain("'self'");
		expect(scriptSrc).not.toContain('unsafe-inline');
		expect(scriptSrc).not.toContain('unsafe-eval');
		expect(csp).toContain("frame-ancestors 'none'");
		expect(csp).toContain("object-src 'none'");
		expect(res.headers.get('x-content-type-options')).toBe('nosniff');
	});
});

describe('cross-site writes', () => {
	it('a cross-origin text/plain POST (a "simple" request, no preflight) is refused', async () => {
		const user = await makeUser(server.db());
		const client = await server.signIn(user.email!, PASSWORD);
		const res = await fetch(`${server.url}/api/projects`, {
			method: 'POST',
			headers: {
				'content-type': 'text/plain',
				origin: 'http://evil.example',
				cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
			},
			body: JSON.stringify({ name: 'planted' })
		});
		expect(res.status).toBe(403);
		const projects = (await (await client.get('/api/projects')).json()).projects;
		expect(projects).toHaveLength(0);
	});

	it('JSON from another origin gets no CORS grant, so a browser never sends it', async () => {
		const res = await fetch(`${server.url}/api/projects`, {
			method: 'OPTIONS',
			headers: {
				origin: 'http://evil.example',
				'access-control-request-method': 'POST',
				'access-control-request-headers': 'content-type'
			}
		});
		expect(res.headers.get('access-control-allow-origin')).toBeNull();
	});

	it('a same-origin JSON write with the wrong content type answers 415 and writes nothing', async () => {
		const user = await makeUser(server.db());
		const client = await server.signIn(user.email!, PASSWORD);
		const res = await client.fetch('/api/projects', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: 'name=x'
		});
		// SvelteKit's origin check passes (same origin), our readJson refuses the type
		expect(res.status).toBe(415);
		expect((await res.json()).error.code).toBe('unsupported-type');
	});

	it('a body over 1 MB answers 413', async () => {
		const user = await makeUser(server.db());
		const client = await server.signIn(user.email!, PASSWORD);
		const res = await client.post('/api/projects', { name: 'big', notes: 'x'.repeat(1_100_000) });
		expect(res.status).toBe(413);
		expect((await res.json()).error.code).toBe('too-large');
	});
});

describe('sign-in throttling', () => {
	it('after 10 wrong passwords an account refuses even the right one for a while', async () => {
		const user = await makeUser(server.db());
		const client = server.anonymous();
		for (let i = 0; i < 10; i++) {
			const res = await client.form('/auth/callback/credentials', {
				email: user.email!,
				password: `wrong ${i}`,
				callbackUrl: '/'
			});
			expect(res.headers.get('location')).toContain('error=CredentialsSignin');
		}
		const right = await client.form('/auth/callback/credentials', {
			email: user.email!,
			password: PASSWORD,
			callbackUrl: '/'
		});
		expect(right.headers.get('location')).toContain('error=CredentialsSignin');
		expect(await client.session()).toBeNull();
	}, 120_000); // ten argon2 verifications are slow on a loaded two-core machine

	it('one address trying many accounts is slowed down too (30 a minute)', async () => {
		const client = server.anonymous();
		let throttled = false;
		for (let i = 0; i < 40 && !throttled; i++) {
			const res = await client.form('/auth/callback/credentials', {
				email: `nobody${i}@test.example`,
				password: 'guess',
				callbackUrl: '/'
			});
			throttled = (res.headers.get('location') ?? '').includes('TooManyAttempts');
		}
		expect(throttled).toBe(true);
	});
});
