import { json } from '@sveltejs/kit';
import { api, ApiError, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { idParam } from '$lib/server/params';
import { deleteType, getType, updateType } from '$lib/server/db/fixture-types';
import { typePatch } from '$lib/schemas/type';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const type = getType(projectId, idParam(event.params.id, 'fixture type'));
	if (!type) throw new ApiError(404, 'No such fixture type in this project.');
	return json(type);
});

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const id = idParam(event.params.id, 'fixture type');
	const patch = await readJson(event, typePatch);
	return json(updateType(projectId, user.id, id, patch));
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	deleteType(projectId, user.id, idParam(event.params.id, 'fixture type'));
	return new Response(null, { status: 204 });
});
