import { LRUCache } from 'lru-cache';
import { promisify } from 'node:util';
import { brotliCompress, brotliCompressSync, constants, gzip, gzipSync } from 'node:zlib';

// Compression of our own dynamic answers (issue 14): JSON and HTML above a threshold, br or gzip as
// the client accepts. adapter-node serves the built static files itself, precompressed at build time
// (`precompress` is on by default), before any hook runs — they never come through here.

/** Below this a compressed answer saves less than a packet and costs a zlib call. */
export const COMPRESS_MIN_BYTES = 1024;
const COMPRESSIBLE = /^(application\/json|text\/html|text\/csv|text\/plain|image\/svg\+xml)\b/;
// brotli quality 4 and gzip level 6: most of the saving at a fraction of the top settings' time,
// which matters when each answer is compressed on the request path
const BR_OPTIONS = { params: { [constants.BROTLI_PARAM_QUALITY]: 4 } };
const GZ_OPTIONS = { level: 6 };
/** Past this, compress on libuv's thread pool so other requests are not held up. */
const ASYNC_FROM_BYTES = 64 * 1024;
const brAsync = promisify(brotliCompress);
const gzAsync = promisify(gzip);

export type Coding = 'br' | 'gzip';

/** The coding to send for an Accept-Encoding header: br first, then gzip; `q=0` refuses one. */
export function chooseCoding(acceptEncoding: string | null): Coding | null {
	if (!acceptEncoding) return null;
	const accepted = new Map<string, number>();
	for (const part of acceptEncoding.split(',')) {
		const [name, ...params] = part.trim().toLowerCase().split(';');
		const q = params.map((p) => /^\s*q=([\d.]+)\s*$/.exec(p)).find(Boolean);
		accepted.set(name.trim(), q ? Number(q[1]) : 1);
	}
	const ok = (c: string) => (accepted.get(c) ?? accepted.get('*') ?? 0) > 0;
	if (ok('br')) return 'br';
	if (ok('gzip')) return 'gzip';
	return null;
}

function compress(body: Uint8Array, coding: Coding): Promise<Uint8Array> | Uint8Array {
	if (body.byteLength >= ASYNC_FROM_BYTES)
		return coding === 'br' ? brAsync(body, BR_OPTIONS) : gzAsync(body, GZ_OPTIONS);
	return coding === 'br' ? brotliCompressSync(body, BR_OPTIONS) : gzipSync(body, GZ_OPTIONS);
}

// Answers with a strong ETag (GET …/patch) are the same bytes until the next write: keep their
// compressed form, bounded by size, keyed by coding, path and tag.
const compressedByTag = new LRUCache<string, Uint8Array>({
	maxSize: 32 * 1024 * 1024,
	sizeCalculation: (v) => Math.max(1, v.byteLength)
});

/** The response compressed for this request when it is worth it; otherwise the response as it was. */
export async function compressResponse(request: Request, response: Response): Promise<Response> {
	if (request.method === 'HEAD' || !response.body || response.status < 200 || response.status === 204) return response;
	if (response.headers.has('content-encoding')) return response;
	// text/event-stream (live updates) never matches: buffering it would hold every event back
	if (!COMPRESSIBLE.test(response.headers.get('content-type') ?? '')) return response;
	const declared = Number(response.headers.get('content-length') ?? NaN);
	if (declared < COMPRESS_MIN_BYTES) return response;
	const coding = chooseCoding(request.headers.get('accept-encoding'));
	if (!/accept-encoding/i.test(response.headers.get('vary') ?? '')) response.headers.append('vary', 'accept-encoding');
	if (!coding) return response;
	const headers = new Headers(response.headers);
	const etag = response.headers.get('etag');
	// the path too: two answers that change at the same writes may carry the same version
	const strong = etag && !etag.startsWith('W/') ? `${coding} ${new URL(request.url).pathname} ${etag}` : null;
	let packed = strong ? compressedByTag.get(strong) : undefined;
	if (!packed) {
		const body = new Uint8Array(await response.arrayBuffer());
		if (body.byteLength < COMPRESS_MIN_BYTES)
			return new Response(body, { status: response.status, statusText: response.statusText, headers });
		packed = await compress(body, coding);
		if (strong) compressedByTag.set(strong, packed);
	} else {
		await response.body.cancel();
	}
	headers.set('content-encoding', coding);
	headers.set('content-length', String(packed.byteLength));
	// a compressed body is another representation: its tag says which (http-cache.ts matches both)
	if (etag && !etag.startsWith('W/')) headers.set('etag', etag.replace(/"$/, coding === 'br' ? '-br"' : '-gz"'));
	return new Response(packed as Uint8Array<ArrayBuffer>, {
		status: response.status,
		statusText: response.statusText,
		headers
	});
}
