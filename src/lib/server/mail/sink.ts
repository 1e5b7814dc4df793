import { simpleParser, type AddressObject } from 'mailparser';
import { randomBytes } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { SMTPServer } from 'smtp-server';

// A local SMTP sink for development and tests: it accepts every message on
// loopback and keeps it as JSON, so nothing leaves the machine.

export interface CaughtMail {
	to: string;
	from: string;
	subject: string;
	text: string;
	html: string;
	date: string;
}

function addressText(value: AddressObject | AddressObject[] | undefined): string {
	if (!value) return '';
	return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(', ');
}

export function startMailSink(port: number, dir: string): Promise<SMTPServer> {
	mkdirSync(dir, { recursive: true });
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		logger: false,
		size: 10 * 1024 * 1024,
		onData(stream, _session, callback) {
			simpleParser(stream)
				.then((parsed) => {
					const mail: CaughtMail = {
						to: addressText(parsed.to),
						from: addressText(parsed.from),
						subject: parsed.subject ?? '',
						text: parsed.text ?? '',
						html: typeof parsed.html === 'string' ? parsed.html : '',
						date: (parsed.date ?? new Date()).toISOString()
					};
					const name = `${Date.now()}-${randomBytes(4).toString('hex')}.json`;
					writeFileSync(join(dir, name), JSON.stringify(mail, null, 2));
					callback();
				})
				.catch((err: Error) => callback(err));
		}
	});
	return new Promise((resolvePromise, reject) => {
		server.once('error', reject);
		server.listen(port, '127.0.0.1', () => resolvePromise(server));
	});
}

/** What the sink caught, newest first. */
export function readCaughtMail(dir: string): CaughtMail[] {
	let names: string[];
	try {
		names = readdirSync(dir).filter((n) => n.endsWith('.json'));
	} catch {
		return [];
	}
	return names
		.sort()
		.reverse()
		.map((n) => JSON.parse(readFileSync(join(dir, n), 'utf8')) as CaughtMail);
}
