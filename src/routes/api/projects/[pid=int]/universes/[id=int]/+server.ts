import { json } from '@sveltejs/kit';
import { api, ApiError, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { detachParam, idParam } from '$lib/server/params';
import { deleteUniverse, getUniverseComputed, updateUniverse } from '$lib/server/db/universes';
import { universePatch } from '$lib/schemas/universe';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const universe = getUniverseComputed(projectId, idParam(event.params.id, 'universe'));
	if (!universe) throw new ApiError(404, 'No such universe in this project.');
	return json(universe);
});

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const id = idParam(event.params.id, 'universe');
	const patch = await readJson(event, universePatch);
	return json(updateUniverse(projectId, user.id, id, patch));
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	deleteUniverse(projectId, user.id, idParam(event.params.id, 'universe'), detachParam(event));
	return new Response(null, { status: 204 });
});
