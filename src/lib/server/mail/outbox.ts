import { and, asc, desc, eq, inArray, lte } from 'drizzle-orm';
import { createTransport, type Transporter } from 'nodemailer';
import { now } from '../clock';
import { mailFrom, smtpUrl } from '../config';
import { db } from '../db/index';
import { mailOutbox } from '../db/schema';
import { NotFoundError } from '../errors';

export interface OutgoingMail {
	to: string;
	subject: string;
	text: string;
	html: string;
}

export interface MailContext {
	/** the project the mail is about: its owners see the mail if it finally fails */
	projectId?: number | null;
	kind?: 'sign-in' | 'account' | 'invitation' | 'review-link' | 'sign-off' | 'other';
}

const HOUR = 3_600_000;
/** how long a message is retried before it is shown to people as failed */
export const GIVE_UP_AFTER_MS = 48 * HOUR;
// growing gaps between attempts, then every 6 hours until GIVE_UP_AFTER_MS has passed
const DELAYS_MS = [1, 2, 5, 15, 30, 60, 120, 240].map((m) => m * 60_000);
const LAST_DELAY_MS = 6 * HOUR;

export function nextDelay(attempts: number): number {
	return DELAYS_MS[attempts - 1] ?? LAST_DELAY_MS;
}

let transport: Transporter | undefined;

// Short connection and greeting timeouts: a mail server that accepts and never answers holds
// only the background sender, never a request, and only for seconds.
function transporter(): Transporter {
	transport ??= createTransport(smtpUrl(), {
		connectionTimeout: 5_000,
		greetingTimeout: 5_000,
		socketTimeout: 20_000
	});
	return transport;
}

const inFlight = new Set<number>();

async function attempt(id: number): Promise<boolean> {
	if (inFlight.has(id)) return false;
	inFlight.add(id);
	try {
		const row = db().select().from(mailOutbox).where(eq(mailOutbox.id, id)).get();
		if (!row || row.status !== 'pending') return row?.status === 'sent';
		try {
			await transporter().sendMail({
				from: mailFrom(),
				to: row.to,
				subject: row.subject,
				text: row.text,
				html: row.html
			});
			db()
				.update(mailOutbox)
				.set({ status: 'sent', sentAt: new Date(now()), attempts: row.attempts + 1, lastError: null })
				.where(eq(mailOutbox.id, id))
				.run();
			return true;
		} catch (err) {
			const message = (err instanceof Error ? err.message : String(err)).slice(0, 500);
			const attempts = row.attempts + 1;
			const at = now();
			const giveUp = row.giveUpAt ? row.giveUpAt.getTime() : row.createdAt.getTime() + GIVE_UP_AFTER_MS;
			const finallyFailed = at >= giveUp;
			db()
				.update(mailOutbox)
				.set({
					status: finallyFailed ? 'failed' : 'pending',
					attempts,
					lastError: message,
					nextAttemptAt: finallyFailed ? null : new Date(at + nextDelay(attempts))
				})
				.where(eq(mailOutbox.id, id))
				.run();
			console.error(
				`mail ${id} to ${row.to} not sent (${finallyFailed ? 'gave up; shown to owners' : 'will retry'}): ${message}`
			);
			return false;
		}
	} finally {
		inFlight.delete(id);
	}
}

/**
 * Store first, send after: the row exists before any SMTP traffic and the caller does not wait
 * for the mail server, so a slow or absent one delays the message but never the answer, and
 * never loses it. Returns the outbox row's id.
 */
export function queueMail(mail: OutgoingMail, context: MailContext = {}): number {
	const at = now();
	const row = db()
		.insert(mailOutbox)
		.values({
			...mail,
			projectId: context.projectId ?? null,
			kind: context.kind ?? 'other',
			createdAt: new Date(at),
			nextAttemptAt: new Date(at),
			giveUpAt: new Date(at + GIVE_UP_AFTER_MS)
		})
		.returning({ id: mailOutbox.id })
		.get();
	setImmediate(() => {
		attempt(row.id).catch((err: unknown) => console.error('mail send failed', err));
	});
	return row.id;
}

/** Tries every pending message whose time has come; called on a timer by the server. */
export async function retryOutbox(): Promise<number> {
	const rows = db()
		.select({ id: mailOutbox.id })
		.from(mailOutbox)
		.where(and(eq(mailOutbox.status, 'pending'), lte(mailOutbox.nextAttemptAt, new Date(now()))))
		.orderBy(asc(mailOutbox.nextAttemptAt))
		.limit(50)
		.all();
	let sent = 0;
	for (const { id } of rows) if (await attempt(id)) sent++;
	return sent;
}

/** Mail about a project that finally failed, newest first (the crew page shows it to owners). */
export function failedMailForProject(projectId: number) {
	return db()
		.select({
			id: mailOutbox.id,
			to: mailOutbox.to,
			subject: mailOutbox.subject,
			kind: mailOutbox.kind,
			attempts: mailOutbox.attempts,
			lastError: mailOutbox.lastError,
			createdAt: mailOutbox.createdAt
		})
		.from(mailOutbox)
		.where(and(eq(mailOutbox.projectId, projectId), eq(mailOutbox.status, 'failed')))
		.orderBy(desc(mailOutbox.id))
		.limit(50)
		.all();
}

/** An owner's "resend": the message goes back in the queue with a fresh 48-hour schedule. */
export function resendFailedMail(projectId: number, id: number): void {
	const at = now();
	const changed = db()
		.update(mailOutbox)
		.set({ status: 'pending', nextAttemptAt: new Date(at), giveUpAt: new Date(at + GIVE_UP_AFTER_MS) })
		.where(and(eq(mailOutbox.id, id), eq(mailOutbox.projectId, projectId), inArray(mailOutbox.status, ['failed'])))
		.run();
	if (changed.changes === 0) throw new NotFoundError('No failed mail with that number in this project.');
	setImmediate(() => {
		attempt(id).catch((err: unknown) => console.error('mail send failed', err));
	});
}
