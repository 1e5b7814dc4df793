import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { detachParam, idParam, versionParam } from '$lib/server/params';
import { deleteCircuit, getCircuit, updateCircuit } from '$lib/server/db/power';
import { circuitPatch } from '$lib/schemas/power';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json(getCircuit(projectId, idParam(event.params.id, 'circuit')));
});

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const id = idParam(event.params.id, 'circuit');
	const patch = await readJson(event, circuitPatch);
	return json(updateCircuit(projectId, user.id, id, patch));
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	deleteCircuit(projectId, user.id, idParam(event.params.id, 'circuit'), {
		detach: detachParam(event),
		version: versionParam(event)
	});
	return new Response(null, { status: 204 });
});
