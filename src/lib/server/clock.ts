import { readFileSync } from 'node:fs';

// The server's idea of "now" for throttles, tokens and the mail outbox. Tests that must cross an
// hour-long window point PATCHWRIGHT_CLOCK_FILE at a file holding an offset in milliseconds; the
// variable is never set in a deployment, and then this is Date.now() and nothing else.

const clockFile = process.env.PATCHWRIGHT_CLOCK_FILE;

function offset(): number {
	if (!clockFile) return 0;
	try {
		return Number(readFileSync(clockFile, 'utf8').trim()) || 0;
	} catch {
		return 0;
	}
}

export function now(): number {
	return clockFile ? Date.now() + offset() : Date.now();
}
