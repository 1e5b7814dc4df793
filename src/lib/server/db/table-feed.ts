import { encodeTableFeed, type TableFeed } from '../../table-feed';
import { loadPatchCached, type PatchData } from './patch';

// The patch page's first load: the cached patch in the table's lean shape, encoded once per change.
const encoded = new WeakMap<PatchData, TableFeed>();
const texts = new WeakMap<PatchData, string>();

export function loadTableFeed(projectId: number): TableFeed {
	const patch = loadPatchCached(projectId);
	let feed = encoded.get(patch);
	if (!feed) encoded.set(patch, (feed = encodeTableFeed(patch)));
	return feed;
}

/**
 * The same feed as JSON text, built once per change. The page load returns this string rather than
 * the object: SvelteKit's serialiser walks every value of an object on every page render (1 MB of
 * arrays at 20,000 fixtures), but copies a string through, and the browser's JSON.parse is faster
 * than evaluating the equivalent object literal.
 */
export function loadTableFeedText(projectId: number): string {
	const patch = loadPatchCached(projectId);
	let text = texts.get(patch);
	if (text === undefined) texts.set(patch, (text = JSON.stringify(loadTableFeed(projectId))));
	return text;
}
