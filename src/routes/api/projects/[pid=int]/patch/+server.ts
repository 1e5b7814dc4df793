import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { patchJsonVersioned } from '$lib/server/db/patch';
import { versionedJson } from '$lib/server/http-cache';
import type { RequestHandler } from './$types';

// The whole patch: universes with their numbers and refresh, types, receivers,
// fixtures with computed slots, and every conflict. Serialised once per write, with an ETag.
export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return versionedJson(event.request, patchJsonVersioned(projectId, event.locals.readState));
});
