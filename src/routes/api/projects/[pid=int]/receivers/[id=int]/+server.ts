import { json } from '@sveltejs/kit';
import { api, ApiError, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { detachParam, idParam } from '$lib/server/params';
import { deleteReceiver, getReceiver, updateReceiver } from '$lib/server/db/receivers';
import { receiverPatch } from '$lib/schemas/receiver';
import { publish } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const receiver = getReceiver(projectId, idParam(event.params.id, 'receiver'));
	if (!receiver) throw new ApiError(404, 'No such receiver in this project.');
	return json(receiver);
});

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const id = idParam(event.params.id, 'receiver');
	const patch = await readJson(event, receiverPatch);
	const after = updateReceiver(projectId, user.id, id, patch);
	publish(projectId, { by: user.id, refetch: true });
	return json(after);
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	deleteReceiver(projectId, user.id, idParam(event.params.id, 'receiver'), detachParam(event));
	publish(projectId, { by: user.id, refetch: true });
	return new Response(null, { status: 204 });
});
