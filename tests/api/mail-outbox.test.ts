import { eq } from 'drizzle-orm';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { createServer, type Server, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort, startServer, type TestServer } from '../helpers/server';
import { makeCrew, PASSWORD, uniqueEmail } from '../helpers/factories';
import { startMailSink } from '../../src/lib/server/mail/sink';
import { mailOutbox } from '../../src/lib/server/db/schema';

// Issue 12 hole 6: mail is never lost to an outage and never holds a request.
// The server's SMTP_URL points at a port the test controls; its clock is moved through
// PATCHWRIGHT_CLOCK_FILE, and the outbox timer ticks every 200 ms of real time.

const HOUR = 3_600_000;

async function until<T>(what: string, check: () => T | undefined | false, ms = 20_000): Promise<T> {
	const deadline = Date.now() + ms;
	for (;;) {
		const value = check();
		if (value) return value;
		if (Date.now() > deadline) throw new Error(`gave up waiting for ${what}`);
		await new Promise((r) => setTimeout(r, 100));
	}
}

describe('an SMTP outage longer than an hour', () => {
	let server: TestServer;
	let clock: string;
	let offset = 0;
	let smtpPort: number;
	const advance = (ms: number) => writeFileSync(clock, String((offset += ms)));

	beforeAll(async () => {
		clock = join(mkdtempSync(join(tmpdir(), 'pw-clock-')), 'clock');
		writeFileSync(clock, '0');
		smtpPort = await freePort();
		server = await startServer({
			env: {
				SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
				PATCHWRIGHT_CLOCK_FILE: clock,
				MAIL_RETRY_INTERVAL_MS: '200'
			}
		});
	}, 60_000);
	afterAll(() => server?.stop());

	const row = (to: string) => server.db().select().from(mailOutbox).where(eq(mailOutbox.to, to)).get();

	it('keeps retrying with growing gaps, is sent when the server returns, and a finally failed one is shown to owners to resend', async () => {
		const { project, crew } = await makeCrew(server.db());
		const owner = await server.signIn(crew.owner.email, PASSWORD);
		const linkTo = uniqueEmail('outage');
		const inviteTo = uniqueEmail('invitee');
		const res = await server.anonymous().form('/auth/signin/nodemailer', { email: linkTo, callbackUrl: '/' });
		expect(res.status).toBe(302);
		expect((await owner.post(`/api/projects/${project.id}/members`, { email: inviteTo, role: 'viewer' })).status).toBe(
			201
		);
		await until('the first failed attempt', () => (row(linkTo)?.attempts ?? 0) >= 1);

		// three hours of outage in steps: every due retry fails, nothing is given up
		let gaps: number[] = [];
		for (let step = 0; step < 12; step++) {
			const before = row(linkTo)!;
			advance(15 * 60_000);
			const after = await until('a retry', () => {
				const r = row(linkTo)!;
				return r.attempts > before.attempts || r.nextAttemptAt!.getTime() > Date.now() + offset ? r : false;
			});
			if (after.attempts > before.attempts) gaps.push(after.nextAttemptAt!.getTime() - (Date.now() + offset));
		}
		expect(row(linkTo)).toMatchObject({ status: 'pending' });
		expect(row(linkTo)!.attempts).toBeGreaterThan(3);
		// the gap between attempts grows
		gaps = gaps.filter((g) => g > 0);
		expect(gaps[gaps.length - 1]).toBeGreaterThan(gaps[0]);

		// the mail server returns: the message goes out
		const sinkDir = mkdtempSync(join(tmpdir(), 'pw-sink-'));
		const sink = await startMailSink(smtpPort, sinkDir);
		try {
			advance(8 * HOUR);
			await until('the sign-in link to be sent', () => row(linkTo)?.status === 'sent');
			const { readCaughtMail } = await import('../../src/lib/server/mail/sink');
			expect(readCaughtMail(sinkDir).some((m) => m.to.includes(linkTo))).toBe(true);
		} finally {
			await new Promise<void>((r) => sink.close(() => r()));
		}

		// an invitation that fails for more than 48 hours is marked failed, never deleted, and shown to the owner
		server.db().update(mailOutbox).set({ status: 'pending' }).where(eq(mailOutbox.to, inviteTo)).run();
		advance(49 * HOUR);
		await until('the invitation to fail for good', () => row(inviteTo)?.status === 'failed');
		const page = await (await owner.get(`/projects/${project.id}/members`)).text();
		expect(page).toContain('Mail that could not be delivered');
		expect(page).toContain(inviteTo);
		const resend = await owner.form(`/projects/${project.id}/members?/resendMail`, { id: String(row(inviteTo)!.id) });
		expect(resend.status).toBe(200);
		expect(['pending', 'failed']).toContain(row(inviteTo)!.status);
		expect(row(inviteTo)!.giveUpAt!.getTime()).toBeGreaterThan(Date.now() + offset + 47 * HOUR);
	}, 180_000);
});

describe('a mail server that accepts and never answers', () => {
	let server: TestServer;
	let hanging: Server;
	const sockets: Socket[] = [];
	let closedBeforeAnswer = false;
	let answered = false;

	beforeAll(async () => {
		const port = await freePort();
		hanging = createServer((socket) => {
			sockets.push(socket);
			socket.on('close', () => {
				if (!answered) closedBeforeAnswer = true;
			});
		});
		await new Promise<void>((r) => hanging.listen(port, '127.0.0.1', () => r()));
		server = await startServer({ env: { SMTP_URL: `smtp://127.0.0.1:${port}` } });
	}, 60_000);
	afterAll(async () => {
		for (const s of sockets) s.destroy();
		hanging?.close();
		await server?.stop();
	});

	it('does not hold the request: the answer comes while the SMTP connection is still waiting for a greeting', async () => {
		const email = uniqueEmail('waiting');
		const res = await server.anonymous().form('/auth/signin/nodemailer', { email, callbackUrl: '/' });
		answered = true;
		expect(res.status).toBe(302);
		expect(res.headers.get('location')).toContain('/auth/verify-request');
		// the message was stored and its send attempted in the background
		await until('the SMTP connection', () => sockets.length > 0);
		expect(closedBeforeAnswer).toBe(false);
		expect(server.db().select().from(mailOutbox).where(eq(mailOutbox.to, email)).get()).toBeDefined();
	});
});
