import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { createCircuit, listCircuits } from '$lib/server/db/power';
import { circuitCreate } from '$lib/schemas/power';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ circuits: listCircuits(projectId) });
});

export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, circuitCreate);
	return json(createCircuit(projectId, user.id, input), { status: 201 });
});
