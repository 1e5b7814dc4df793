import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { listReceivers } from '$lib/server/db/patch';
import { createReceiver } from '$lib/server/db/receivers';
import { receiverCreate } from '$lib/schemas/receiver';
import { publish } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ receivers: listReceivers(projectId) });
});

export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, receiverCreate);
	const created = createReceiver(projectId, user.id, input);
	// open pages list receivers: they refetch
	publish(projectId, { by: user.id, refetch: true });
	return json(created, { status: 201 });
});
