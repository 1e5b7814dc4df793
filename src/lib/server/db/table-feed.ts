import { encodeTableFeed, type TableFeed } from '../../table-feed';
import { loadPatchCached, type PatchData } from './patch';

// The patch page's first load: the cached patch in the table's lean shape, encoded once per change.
const encoded = new WeakMap<PatchData, TableFeed>();

export function loadTableFeed(projectId: number): TableFeed {
	const patch = loadPatchCached(projectId);
	let feed = encoded.get(patch);
	if (!feed) encoded.set(patch, (feed = encodeTableFeed(patch)));
	return feed;
}
