import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { createPackType, listPackTypes } from '$lib/server/db/power';
import { packTypeCreate } from '$lib/schemas/power';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ packTypes: listPackTypes(projectId) });
});

export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, packTypeCreate);
	return json(createPackType(projectId, user.id, input), { status: 201 });
});
