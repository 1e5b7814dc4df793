import { createHash, randomBytes } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { unflatten } from 'devalue';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fixtures, reviewLinks } from '../../src/lib/server/db/schema';
import { addMember, makeProject, makeUser, PASSWORD } from '../helpers/factories';
import { fingerprint } from '../helpers/fingerprint';
import { demoProjectId, twoDmxFixtures, waitForMail } from '../helpers/revisions';
import { startServer, type Client, type TestServer } from '../helpers/server';

// Behaviour from DESIGN.md ("Review link", "Roles": a link reads one revision and signs it off, nothing else).

let server: TestServer;
let pid: number;
let programmer: Client;
let owner: Client;
let viewer: Client;

const tokenOf = (url: string) => new URL(url).pathname.split('/').pop()!;
const forged = () => randomBytes(32).toString('base64url');

beforeAll(async () => {
	server = await startServer({ demo: true });
	pid = demoProjectId(server.db());
	[programmer, owner, viewer] = await Promise.all([
		server.signIn('programmer@demo.test'),
		server.signIn('owner@demo.test'),
		server.signIn('viewer@demo.test')
	]);
	for (const note of ['First pass', 'Second pass']) {
		expect((await programmer.post(`/api/projects/${pid}/revisions`, { note })).status).toBe(201);
	}
});
afterAll(() => server?.stop());

async function makeLink(client: Client, body: Record<string, unknown>) {
	const res = await client.post(`/api/projects/${pid}/review-links`, body);
	expect(res.status).toBe(201);
	return (await res.json()) as { id: number; url: string; expiresAt: string | null };
}

describe('review links', () => {
	it('only owners and programmers make or list links; the token is 256 bits, in the url once, and stored only as its SHA-256', async () => {
		expect((await viewer.post(`/api/projects/${pid}/review-links`, { revision: 1 })).status).toBe(403);
		expect((await viewer.get(`/api/projects/${pid}/review-links`)).status).toBe(403);
		const link = await makeLink(programmer, { revision: 1, expiresInDays: 7 });
		expect(link.url.startsWith(`${server.url}/review/`)).toBe(true);
		const token = tokenOf(link.url);
		expect(Buffer.from(token, 'base64url')).toHaveLength(32);
		const row = server.db().select().from(reviewLinks).where(eq(reviewLinks.id, link.id)).get()!;
		expect(row.tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
		expect(JSON.stringify(row)).not.toContain(token);
		// 7 days from now, give or take the request
		expect(Math.abs(new Date(link.expiresAt!).getTime() - (Date.now() + 7 * 86_400_000))).toBeLessThan(60_000);
		const list = await (await owner.get(`/api/projects/${pid}/review-links`)).json();
		expect(list.reviewLinks[0]).toMatchObject({ id: link.id, revision: 1, status: 'active' });
		expect(JSON.stringify(list)).not.toContain(token);
		expect((await programmer.post(`/api/projects/${pid}/review-links`, { revision: 99 })).status).toBe(404);
	});

	it('the token reads its own revision with no account, and nothing else', async () => {
		const link = await makeLink(programmer, { revision: 1 });
		const token = tokenOf(link.url);
		const anon = server.anonymous();
		const res = await anon.get(`/api/review/${token}?revision=2`);
		expect(res.status).toBe(200);
		const body = await res.json();
		expect(body.revision).toMatchObject({ number: 1, note: 'First pass', author: 'Pim Programmer' });
		expect(body.project).toEqual({
			name: 'The Lantern Ferry — river unit',
			venue: 'Moored ferry, north quay (invented)',
			startsOn: '2027-03-08',
			endsOn: '2027-03-19'
		});
		expect(body.patch.fixtures).toHaveLength(46);
		expect(body.patch.summary.errors).toBeGreaterThan(0);
		expect(body.diff).toBeNull();
		// the project API stays closed to a token holder, however the token is presented
		const presented: Record<string, string>[] = [
			{ authorization: `Bearer ${token}` },
			{ cookie: `authjs.session-token=${token}` }
		];
		for (const headers of presented) {
			for (const path of [`/api/projects/${pid}/revisions/2`, `/api/projects/${pid}/patch`, `/api/projects`]) {
				expect((await anon.fetch(path, { headers })).status).toBe(401);
			}
		}
		expect((await anon.get(`/api/review/${token}/../../projects/${pid}/revisions/2`)).status).not.toBe(200);
	});

	it('a link into another project never shows this one', async () => {
		const other = makeProject(server.db(), { name: 'Other production' });
		const user = await makeUser(server.db());
		addMember(server.db(), other.id, user.id, 'programmer');
		const theirs = await server.signIn(user.email!, PASSWORD);
		expect((await theirs.post(`/api/projects/${other.id}/revisions`, { note: 'theirs' })).status).toBe(201);
		const link = await (await theirs.post(`/api/projects/${other.id}/review-links`, { revision: 1 })).json();
		const body = await (await server.anonymous().get(`/api/review/${tokenOf(link.url)}`)).json();
		expect(body.project.name).toBe('Other production');
		expect(body.patch.fixtures).toEqual([]);
		// and that programmer cannot point a link at the demo project's revision
		expect((await theirs.post(`/api/projects/${pid}/review-links`, { revision: 1 })).status).toBe(404);
	});

	it('revoked and expired links answer 410 with a clear message; forged and malformed tokens 404', async () => {
		const revoked = await makeLink(programmer, { revision: 2 });
		expect((await programmer.delete(`/api/projects/${pid}/review-links/${revoked.id}`)).status).toBe(204);
		let res = await server.anonymous().get(`/api/review/${tokenOf(revoked.url)}`);
		expect(res.status).toBe(410);
		expect((await res.json()).error).toMatchObject({ code: 'gone', message: expect.stringContaining('withdrawn') });
		expect(
			(
				await server
					.anonymous()
					.post(`/api/review/${tokenOf(revoked.url)}/signoff`, { name: 'X', decision: 'approved', comment: '' })
			).status
		).toBe(410);

		const expired = await makeLink(programmer, { revision: 2, expiresInDays: 1 });
		server
			.db()
			.update(reviewLinks)
			.set({ expiresAt: new Date(Date.now() - 1000) })
			.where(eq(reviewLinks.id, expired.id))
			.run();
		res = await server.anonymous().get(`/api/review/${tokenOf(expired.url)}`);
		expect(res.status).toBe(410);
		expect((await res.json()).error.message).toContain('expired');

		for (const token of [forged(), 'short', 'x'.repeat(43)]) {
			res = await server.anonymous().get(`/api/review/${token}`);
			expect(res.status).toBe(404);
			expect((await res.json()).error.code).toBe('not-found');
		}
		expect((await programmer.delete(`/api/projects/${pid}/review-links/99999`)).status).toBe(404);
		expect((await viewer.delete(`/api/projects/${pid}/review-links/${expired.id}`)).status).toBe(403);
	});

	it('a "latest" link resolves at request time, and says so clearly while there is no revision', async () => {
		const empty = makeProject(server.db(), { name: 'Not started' });
		const user = await makeUser(server.db());
		addMember(server.db(), empty.id, user.id, 'owner');
		const them = await server.signIn(user.email!, PASSWORD);
		const link = await (
			await them.post(`/api/projects/${empty.id}/review-links`, { revision: 'latest', expiresInDays: null })
		).json();
		expect(link.expiresAt).toBeNull();
		let res = await server.anonymous().get(`/api/review/${tokenOf(link.url)}`);
		expect(res.status).toBe(404);
		expect((await res.json()).error.message).toContain('no revision');
		await them.post(`/api/projects/${empty.id}/revisions`, { note: 'one' });
		res = await server.anonymous().get(`/api/review/${tokenOf(link.url)}`);
		expect((await res.json()).revision.number).toBe(1);
		await them.post(`/api/projects/${empty.id}/revisions`, { note: 'two' });
		res = await server.anonymous().get(`/api/review/${tokenOf(link.url)}`);
		expect((await res.json()).revision).toMatchObject({ number: 2, note: 'two' });
	});

	it('a sign-off by link is stored under the given name and mailed to each owner and programmer', async () => {
		const link = await makeLink(programmer, { revision: 2 });
		const token = tokenOf(link.url);
		const bad = await server
			.anonymous()
			.post(`/api/review/${token}/signoff`, { name: '', decision: 'approved', comment: '' });
		expect(bad.status).toBe(400);
		const res = await server
			.anonymous()
			.post(`/api/review/${token}/signoff`, { name: 'Pat Producer', decision: 'approved', comment: 'Go ahead' });
		expect(res.status).toBe(201);
		expect(await res.json()).toMatchObject({
			decision: 'approved',
			name: 'Pat Producer',
			comment: 'Go ahead',
			revision: 2,
			stale: false
		});
		const revision = await (await viewer.get(`/api/projects/${pid}/revisions/2`)).json();
		expect(revision.signoffs).toEqual([
			expect.objectContaining({ decision: 'approved', name: 'Pat Producer', comment: 'Go ahead' })
		]);

		const mails = await waitForMail(
			server,
			(m) => m.subject.includes('Revision 2 approved') && m.text.includes('Pat Producer'),
			2
		);
		expect(mails.map((m) => m.to).sort()).toEqual(['owner@demo.test', 'programmer@demo.test']);
		expect(mails[0].text).toContain(`${server.url}/projects/${pid}/revisions`);
		expect(mails[0].html).toContain('Pat Producer');
	});

	it('the review shows the diff since the last approved revision, naming what changed', async () => {
		const [a] = twoDmxFixtures(server.db(), pid);
		server.db().update(fixtures).set({ address: 480 }).where(eq(fixtures.id, a.id)).run();
		await programmer.post(`/api/projects/${pid}/revisions`, { note: 'Third pass' });
		const link = await makeLink(programmer, { revision: 'latest' });
		const body = await (await server.anonymous().get(`/api/review/${tokenOf(link.url)}`)).json();
		expect(body.revision.number).toBe(3);
		expect(body.diff.since).toBe(2);
		expect(body.diff.changed).toEqual([
			{
				fixtureId: a.id,
				number: a.number,
				label: a.label,
				fields: [{ field: 'control.address', before: a.address, after: 480 }]
			}
		]);
		// the approval of revision 2 is now stale
		expect((await (await viewer.get(`/api/projects/${pid}/revisions/2`)).json()).signoffs[0].stale).toBe(true);
	});

	it('a link can be e-mailed to the producer', async () => {
		const link = await makeLink(owner, { revision: 2, email: 'Producer@Example.test' });
		const [mail] = await waitForMail(server, (m) => m.to === 'producer@example.test');
		expect(mail.text).toContain('The Lantern Ferry');
		expect(mail.text).toContain(link.url);
		expect(mail.html).toContain(link.url);
	});
});

describe('review links and new revisions', () => {
	it('a new revision behind an "always the latest" link is mailed to the link’s holder, in the review page’s words', async () => {
		const [, b] = twoDmxFixtures(server.db(), pid);
		await makeLink(owner, { revision: 'latest', email: 'night-producer@example.test' });
		// a link to one fixed revision does not follow new revisions, so its holder is not told
		await makeLink(owner, { revision: 1, email: 'fixed-producer@example.test' });
		server.db().update(fixtures).set({ address: 301 }).where(eq(fixtures.id, b.id)).run();
		const made = await (await programmer.post(`/api/projects/${pid}/revisions`, { note: 'Night two' })).json();
		const [mail] = await waitForMail(
			server,
			(m) => m.to === 'night-producer@example.test' && m.subject.includes(`revision ${made.number} is ready`)
		);
		expect(mail.text).toContain('Night two');
		expect(mail.text).toMatch(new RegExp(`Fixture ${b.number} .*moved from \\d+\\.${b.address} to \\d+\\.301`));
		expect(mail.text).not.toMatch(/control\.address|universeId|modeId/);
		const fixed = await waitForMail(server, (m) => m.to === 'fixed-producer@example.test');
		expect(fixed.every((m) => !m.subject.includes('is ready to review'))).toBe(true);
	});

	it('the review and the sign-off mail word the changes the same way', async () => {
		const link = await makeLink(programmer, { revision: 'latest' });
		const body = await (await server.anonymous().get(`/api/review/${tokenOf(link.url)}`)).json();
		const lines: string[] = body.diff.changes.plan.map((l: { text: string }) => l.text);
		expect(lines.length).toBeGreaterThan(0);
		await server
			.anonymous()
			.post(`/api/review/${tokenOf(link.url)}/signoff`, { name: 'Wordy Producer', decision: 'approved', comment: '' });
		// names stay out of subjects (the sender's words are marked in the body)
		const [mail] = await waitForMail(
			server,
			(m) => m.subject.includes('approved') && m.text.includes('Wordy Producer'),
			2
		);
		for (const line of lines) expect(mail.text).toContain(line);
	});
});

describe('rate limits (PATCHWRIGHT_RATE_SCALE=1)', () => {
	it('token lookups are limited per address, so tokens cannot be tried by the thousand', async () => {
		const strict = await startServer({ env: { PATCHWRIGHT_RATE_SCALE: '1' } });
		try {
			const anon = strict.anonymous();
			const statuses: number[] = [];
			for (let i = 0; i < 61; i++) statuses.push((await anon.get(`/api/review/${forged()}`)).status);
			expect(statuses.slice(0, 60).every((s) => s === 404)).toBe(true);
			expect(statuses[60]).toBe(429);
			const res = await anon.post(`/api/review/${forged()}/signoff`, { name: 'X', decision: 'approved', comment: '' });
			expect(res.status).toBe(429);
			expect((await res.json()).error.code).toBe('rate-limited');
		} finally {
			await strict.stop();
		}
	});
});

describe('sheets through a review link', () => {
	it('print the link’s own revision and refuse other sheets and forged tokens', async () => {
		const s = await startServer({ demo: true });
		try {
			const programmer = await s.signIn('programmer@demo.test');
			const pid = (await (await programmer.get('/api/projects')).json()).projects[0].id;
			expect((await programmer.post(`/api/projects/${pid}/revisions`, { note: 'first' })).status).toBe(201);
			expect((await programmer.post(`/api/projects/${pid}/revisions`, { note: 'second' })).status).toBe(201);
			const link = await (await programmer.post(`/api/projects/${pid}/review-links`, { revision: 1 })).json();
			const path = new URL(link.url).pathname.replace('/review/', '/api/review/');
			const anon = s.anonymous();
			const pdf = await anon.get(`${path}/sheets/patch.pdf?revision=2`);
			expect(pdf.status).toBe(200);
			expect(pdf.headers.get('content-type')).toBe('application/pdf');
			// the token's revision wins over the query: the file is revision 1's
			expect(pdf.headers.get('content-disposition')).toContain('-patch-r1.pdf');
			expect((await anon.get(`${path}/sheets/labels.pdf`)).status).toBe(200);
			expect((await anon.get(`${path}/sheets/secrets.pdf`)).status).toBe(404);
			expect((await anon.get(`/api/review/${'A'.repeat(43)}/sheets/patch.pdf`)).status).toBe(404);
		} finally {
			await s.stop();
		}
	});
});

// Last in the file: it makes a revision, and its decisions are requests for changes, so no
// approval moves under the tests above.
describe('one decision per link and revision', () => {
	const signoff = (token: string, body: Record<string, string>) =>
		server.anonymous().post(`/api/review/${token}/signoff`, body);
	const formSignoff = async (token: string, fields: Record<string, string>) => {
		const res = await server.anonymous().fetch(`/review/${token}?/signoff`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-sveltekit-action': 'true' },
			body: new URLSearchParams(fields).toString()
		});
		const body = (await res.json()) as { type: string; status: number; data: string };
		return { ...body, data: body.data ? (unflatten(JSON.parse(body.data)) as { message: string }) : undefined };
	};

	it('a link that decided shows the decision and refuses a second one, by API and by form, writing nothing', async () => {
		const token = tokenOf((await makeLink(programmer, { revision: 1 })).url);
		const first = await signoff(token, { name: 'Firm Producer', decision: 'changes-requested', comment: 'Move 12' });
		expect(first.status).toBe(201);
		const review = await (await server.anonymous().get(`/api/review/${token}`)).json();
		expect(review.link.signoff).toEqual({
			decision: 'changes-requested',
			name: 'Firm Producer',
			comment: 'Move 12',
			at: expect.any(String),
			revision: 1
		});

		const before = fingerprint(server.db(), pid);
		const again = await signoff(token, { name: 'Other Person', decision: 'approved', comment: '' });
		expect(again.status).toBe(409);
		const body = await again.json();
		expect(body.error.code).toBe('already-decided');
		expect(body.error.message).toMatch(/already.*revision 1.*Firm Producer/);
		expect(body.signoff).toEqual(review.link.signoff);
		const form = await formSignoff(token, { name: 'Other Person', decision: 'approved', comment: '' });
		expect(form).toMatchObject({ type: 'failure', status: 409 });
		expect(form.data?.message).toMatch(/already/);
		expect(fingerprint(server.db(), pid)).toBe(before);
		const revision = await (await viewer.get(`/api/projects/${pid}/revisions/1`)).json();
		expect(revision.signoffs.filter((s: { name: string }) => s.name === 'Other Person')).toEqual([]);

		// another link to the same revision is another decision
		const other = tokenOf((await makeLink(programmer, { revision: 1 })).url);
		expect((await (await server.anonymous().get(`/api/review/${other}`)).json()).link.signoff).toBeNull();
		expect((await signoff(other, { name: 'Second Producer', decision: 'approved', comment: '' })).status).toBe(201);
	});

	it('an "always the latest" link decides again once a new revision is behind it', async () => {
		const token = tokenOf((await makeLink(programmer, { revision: 'latest' })).url);
		const latest = (await (await server.anonymous().get(`/api/review/${token}`)).json()).revision.number as number;
		expect((await signoff(token, { name: 'Late Producer', decision: 'changes-requested', comment: '' })).status).toBe(
			201
		);
		const form = await formSignoff(token, { name: 'Late Producer', decision: 'changes-requested', comment: '' });
		expect(form).toMatchObject({ type: 'failure', status: 409 });

		expect((await programmer.post(`/api/projects/${pid}/revisions`, { note: 'After the notes' })).status).toBe(201);
		const review = await (await server.anonymous().get(`/api/review/${token}`)).json();
		expect(review.revision.number).toBe(latest + 1);
		expect(review.link.signoff).toBeNull();
		const accepted = await formSignoff(token, { name: 'Late Producer', decision: 'changes-requested', comment: '' });
		expect(accepted).toMatchObject({ type: 'redirect' });
		expect((await signoff(token, { name: 'Late Producer', decision: 'approved', comment: '' })).status).toBe(409);
	});
});
