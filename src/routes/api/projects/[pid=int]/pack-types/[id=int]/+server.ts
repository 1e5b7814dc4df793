import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { detachParam, idParam, versionParam } from '$lib/server/params';
import { deletePackType, getPackType, updatePackType } from '$lib/server/db/power';
import { packTypePatch } from '$lib/schemas/power';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json(getPackType(projectId, idParam(event.params.id, 'pack type')));
});

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const id = idParam(event.params.id, 'pack type');
	const patch = await readJson(event, packTypePatch);
	return json(updatePackType(projectId, user.id, id, patch));
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	deletePackType(projectId, user.id, idParam(event.params.id, 'pack type'), {
		detach: detachParam(event),
		version: versionParam(event)
	});
	return new Response(null, { status: 204 });
});
