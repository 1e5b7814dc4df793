// The one check for every redirect target taken from input (callbackUrl, "back to" links):
// only a path on this site. Anything else — absolute or protocol-relative URLs, backslashes
// (browsers read `/\evil` as `//evil`), control characters (browsers drop a tab, so `/\t/evil`
// becomes `//evil`; CR/LF break the header), anything outside printable ASCII — falls back to `/`.
// Never throws.

const BASE = 'http://patchwright.invalid';

export function safeRedirect(value: unknown, fallback = '/'): string {
	if (typeof value !== 'string' || value.length === 0 || value.length > 2000) return fallback;
	if (!/^[\x21-\x7e]+$/.test(value) || value.includes('\\')) return fallback;
	if (!value.startsWith('/') || value.startsWith('//')) return fallback;
	let url: URL;
	try {
		url = new URL(value, BASE);
	} catch {
		return fallback;
	}
	if (url.origin !== BASE) return fallback;
	const path = url.pathname + url.search + url.hash;
	// dot segments can normalise into a protocol-relative path: `/.//evil` → `//evil`
	return path.startsWith('//') ? fallback : path;
}
