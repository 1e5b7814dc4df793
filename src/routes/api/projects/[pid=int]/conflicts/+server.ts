import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { conflictsJsonCached } from '$lib/server/db/patch';
import { versionedJson } from '$lib/server/http-cache';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return versionedJson(event.request, conflictsJsonCached(projectId, event.locals.readState));
});
