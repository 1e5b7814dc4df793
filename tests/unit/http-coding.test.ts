import { describe, expect, it } from 'vitest';
import { chooseCoding } from '../../src/lib/server/compress';
import { entityTag, matches } from '../../src/lib/server/http-cache';

// RFC 9110 §12.5.3 Accept-Encoding (q-values, `*`, q=0 refuses) and §13.1.2 If-None-Match
// (a list of tags, `*`, weak comparison W/).

describe('chooseCoding', () => {
	it('prefers br, then gzip, and honours q=0', () => {
		expect(chooseCoding('gzip, deflate, br')).toBe('br');
		expect(chooseCoding('gzip, deflate')).toBe('gzip');
		expect(chooseCoding('br;q=0, gzip;q=0.5')).toBe('gzip');
		expect(chooseCoding('br;q=0, gzip;q=0')).toBeNull();
		expect(chooseCoding('deflate')).toBeNull();
		expect(chooseCoding('identity')).toBeNull();
		expect(chooseCoding(null)).toBeNull();
		expect(chooseCoding('')).toBeNull();
	});

	it('reads `*` as any coding not named otherwise', () => {
		expect(chooseCoding('*')).toBe('br');
		expect(chooseCoding('br;q=0, *')).toBe('gzip');
		expect(chooseCoding('*;q=0')).toBeNull();
		expect(chooseCoding('GZIP ; Q=1')).toBe('gzip');
	});
});

describe('matches (If-None-Match)', () => {
	const v = 'patch.1.abc.3.7';
	it('matches the plain tag and its compressed forms, in a list, weak or strong', () => {
		expect(entityTag(v)).toBe('"patch.1.abc.3.7"');
		expect(matches('"patch.1.abc.3.7"', v)).toBe(true);
		expect(matches('"patch.1.abc.3.7-br"', v)).toBe(true);
		expect(matches('"other", W/"patch.1.abc.3.7-gz"', v)).toBe(true);
		expect(matches('*', v)).toBe(true);
	});

	it('does not match another version, another answer or nothing', () => {
		expect(matches('"patch.1.abc.3.8"', v)).toBe(false);
		expect(matches('"conflicts.1.abc.3.7"', v)).toBe(false);
		expect(matches('"patch.1.abc.3.7-xz"', v)).toBe(false);
		expect(matches(null, v)).toBe(false);
		expect(matches('', v)).toBe(false);
	});
});
