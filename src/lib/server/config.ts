import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { databasePath } from './db/index';

// Every setting the server reads, in one place; see .env.example.

export function dataDir(): string {
	return dirname(databasePath());
}

export function uploadsDir(): string {
	return resolve(process.env.UPLOADS_DIR || join(dataDir(), 'uploads'));
}

export function mailSinkDir(): string {
	return resolve(process.env.MAIL_SINK_DIR || join(dataDir(), 'mail'));
}

/**
 * /dev/mail and friends exist only while mail goes to the local sink and the
 * deployment has not declared itself production.
 */
export function devPagesEnabled(clientAddress: string): boolean {
	return !process.env.SMTP_URL && process.env.PATCHWRIGHT_ENV !== 'production' && isLoopback(clientAddress);
}

/**
 * The caught mail holds sign-in links, so only this machine may read it, even
 * when the server listens on a set network for the crew's phones.
 */
export function isLoopback(address: string): boolean {
	return address === '::1' || address.startsWith('127.') || address.startsWith('::ffff:127.');
}

/** The address people reach the app on; used in e-mailed links and QR codes. */
export function publicBaseUrl(): string {
	const configured = process.env.PUBLIC_BASE_URL || process.env.ORIGIN;
	if (configured) return configured.replace(/\/+$/, '');
	return `http://${process.env.HOST || '127.0.0.1'}:${process.env.PORT || '3000'}`;
}

export function mailFrom(): string {
	return process.env.MAIL_FROM || 'Patchwright <patchwright@localhost>';
}

/** A real SMTP server when SMTP_URL is set, else the local sink the scripts start. */
export function smtpUrl(): string {
	return process.env.SMTP_URL || `smtp://127.0.0.1:${sinkPort()}`;
}

export function sinkPort(): number {
	return Number(process.env.SMTP_PORT || 2525);
}

/**
 * AUTH_SECRET from the environment, or one generated into data/ on first run
 * (mode 0600, never committed) so sessions survive a restart.
 */
export function authSecret(): string {
	if (process.env.AUTH_SECRET) return process.env.AUTH_SECRET;
	const file = join(dataDir(), 'auth-secret');
	if (!existsSync(file)) {
		mkdirSync(dirname(file), { recursive: true });
		writeFileSync(file, randomBytes(32).toString('base64url'), { mode: 0o600 });
	}
	const secret = readFileSync(file, 'utf8').trim();
	process.env.AUTH_SECRET = secret;
	return secret;
}
