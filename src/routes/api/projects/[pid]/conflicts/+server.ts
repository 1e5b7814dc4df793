import { json } from '@sveltejs/kit';
import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { loadPatch } from '$lib/server/db/patch';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ conflicts: loadPatch(projectId).conflicts });
});
