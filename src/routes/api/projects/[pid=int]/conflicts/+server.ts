import { json } from '@sveltejs/kit';
import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { loadPatchCached } from '$lib/server/db/patch';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ conflicts: loadPatchCached(projectId).conflicts });
});
