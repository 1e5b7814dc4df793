import { requireRole } from '$lib/server/authz';
import type { PageServerLoad } from './$types';

// The table renders in the browser from GET /api/projects/:pid/patch: a
// 20,000-fixture project must not ship 20,000 rows of HTML (or a second copy
// of the JSON inlined into the page), so the server load only checks the role.
export const load: PageServerLoad = (event) => {
	const { role } = requireRole(event, event.params.id, 'viewer');
	return { role };
};
