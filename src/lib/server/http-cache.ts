import type { VersionedJson } from './db/patch';

// Large JSON answers that are the same until the next write (GET …/patch, …/conflicts): sent with
// an ETag made from the write counter, so a client that already holds this version gets 304 and no
// body. `no-cache` makes the browser ask every time (the answer is never shown stale), and
// `private` keeps shared caches out: requireRole runs before any of this, on every request.

/** An entity tag for one version; compress.ts appends the coding (`-br`, `-gz`) for compressed bodies. */
export function entityTag(version: string): string {
	return `"${version}"`;
}

/** True when If-None-Match names this version (in any content coding, or `*`). */
export function matches(ifNoneMatch: string | null, version: string): boolean {
	if (!ifNoneMatch) return false;
	return ifNoneMatch.split(',').some((raw) => {
		const tag = raw.trim().replace(/^W\//, '');
		return tag === '*' || tag.replace(/-(br|gz)"$/, '"') === entityTag(version);
	});
}

const SMALL_BODY_BYTES = 64 * 1024;

export function versionedJson(request: Request, answer: VersionedJson): Response {
	const { version } = answer;
	const headers = {
		'content-type': 'application/json',
		etag: entityTag(version),
		'cache-control': 'private, no-cache',
		vary: 'accept-encoding'
	};
	if (matches(request.headers.get('if-none-match'), version)) return new Response(null, { status: 304, headers });
	const bytes = answer.bytes();
	// the length lets compress.ts pass a small answer by without reading it; a small body goes as its
	// text, which undici wraps more cheaply than bytes, a large one as the bytes encoded once per change
	return new Response(bytes.byteLength < SMALL_BODY_BYTES ? answer.json : (bytes as Uint8Array<ArrayBuffer>), {
		headers: { ...headers, 'content-length': String(bytes.byteLength) }
	});
}
