import { and, eq, lt, inArray } from 'drizzle-orm';
import { createTransport, type Transporter } from 'nodemailer';
import { mailFrom, smtpUrl } from '../config';
import { db } from '../db/index';
import { mailOutbox } from '../db/schema';

export interface OutgoingMail {
	to: string;
	subject: string;
	text: string;
	html: string;
}

const MAX_ATTEMPTS = 5;
let transport: Transporter | undefined;

function transporter(): Transporter {
	transport ??= createTransport(smtpUrl());
	return transport;
}

async function attempt(id: number): Promise<boolean> {
	const row = db().select().from(mailOutbox).where(eq(mailOutbox.id, id)).get();
	if (!row || row.status === 'sent') return true;
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
			.set({ status: 'sent', sentAt: new Date(), attempts: row.attempts + 1, lastError: null })
			.where(eq(mailOutbox.id, id))
			.run();
		return true;
	} catch (err) {
		const message = err instanceof Error ? err.message : String(err);
		db()
			.update(mailOutbox)
			.set({ status: 'failed', attempts: row.attempts + 1, lastError: message.slice(0, 500) })
			.where(eq(mailOutbox.id, id))
			.run();
		console.error(`mail ${id} to ${row.to} not sent (will retry): ${message}`);
		return false;
	}
}

/**
 * Store first, send after: the row exists before any SMTP traffic, so a mail
 * server that is down delays the message but never loses it.
 * Resolves to whether the first attempt went out.
 */
export async function sendMail(mail: OutgoingMail): Promise<boolean> {
	const row = db().insert(mailOutbox).values(mail).returning({ id: mailOutbox.id }).get();
	return attempt(row.id);
}

/** Retries what is still pending or failed; called on a timer by the server. */
export async function retryOutbox(): Promise<number> {
	const rows = db()
		.select({ id: mailOutbox.id })
		.from(mailOutbox)
		.where(and(inArray(mailOutbox.status, ['pending', 'failed']), lt(mailOutbox.attempts, MAX_ATTEMPTS)))
		.limit(50)
		.all();
	let sent = 0;
	for (const { id } of rows) if (await attempt(id)) sent++;
	return sent;
}
