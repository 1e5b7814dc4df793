import { describe, expect, it } from 'vitest';
import { safeRedirect } from '../../src/lib/server/redirect';

// The one redirect-target check (issue 12, hole 3). Browser behaviour it guards against, from the
// WHATWG URL Standard: a backslash is a path separator in special schemes, and tab/CR/LF are
// stripped before parsing — so `/\evil` and `/<TAB>/evil` both mean `//evil`, another host.

describe('safeRedirect', () => {
	it.each([
		['/\\evil.example/x'],
		['/\t/evil.example'],
		['//evil.example'],
		['https://evil.example/'],
		['/.//evil.example'],
		['/\r\nSet-Cookie: x=1'],
		['/café'],
		['javascript:alert(1)'],
		[''],
		['relative/path'],
		['/' + 'a'.repeat(3000)]
	])('refuses %j', (value) => {
		expect(safeRedirect(value)).toBe('/');
	});

	it('keeps same-site paths with query and hash, normalising dot segments', () => {
		expect(safeRedirect('/projects/3/fixtures/7?from=label#top')).toBe('/projects/3/fixtures/7?from=label#top');
		expect(safeRedirect('/projects/3/../4')).toBe('/projects/4');
	});

	it('never throws on odd input', () => {
		for (const value of [null, undefined, 42, {}, '%', '/%zz', '/\u0000']) {
			expect(() => safeRedirect(value)).not.toThrow();
		}
	});
});
