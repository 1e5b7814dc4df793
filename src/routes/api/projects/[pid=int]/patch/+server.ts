import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { patchJsonCached } from '$lib/server/db/patch';
import type { RequestHandler } from './$types';

// The whole patch: universes with their numbers and refresh, types, receivers,
// fixtures with computed slots, and every conflict.
export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return new Response(patchJsonCached(projectId), { headers: { 'content-type': 'application/json' } });
});
