import { describe, expect, it } from 'vitest';
import { isLoopback } from '../../src/lib/server/config';

describe('the caught-mail pages answer only this machine', () => {
	it.each(['127.0.0.1', '127.1.2.3', '::1', '::ffff:127.0.0.1'])('%s is loopback', (a) => {
		expect(isLoopback(a)).toBe(true);
	});
	it.each(['192.168.1.20', '10.0.0.5', '::ffff:192.168.1.20', 'fe80::1', '1.127.0.0'])('%s is not', (a) => {
		expect(isLoopback(a)).toBe(false);
	});
});
