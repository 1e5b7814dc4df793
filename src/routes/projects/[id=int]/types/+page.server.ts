import { requireRole } from '$lib/server/authz';
import { loadPatchCached } from '$lib/server/db/patch';
import type { PageServerLoad } from './$types';

// The same cached patch GET …/patch answers, after the same requireRole (no second trip through the API).
export const load: PageServerLoad = (event) => {
	const { role, projectId } = requireRole(event, event.params.id, 'viewer');
	return { role, types: loadPatchCached(projectId).types };
};
