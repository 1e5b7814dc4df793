import { requireRole } from '$lib/server/authz';
import { loadTableFeedText } from '$lib/server/db/table-feed';
import type { PageServerLoad } from './$types';

// The table's rows come with the page in a lean shape ($lib/table-feed: about 1 MB at 20,000
// fixtures against 7.7 MB of GET …/patch), read from the db function the API uses; the table
// itself renders in the browser, windowed, so the HTML carries no rows. The feed goes as JSON text
// cached per change (db/table-feed.ts says why).
export const load: PageServerLoad = (event) => {
	const { role, projectId } = requireRole(event, event.params.id, 'viewer');
	event.depends('patch:feed');
	return { role, feed: loadTableFeedText(projectId) };
};
