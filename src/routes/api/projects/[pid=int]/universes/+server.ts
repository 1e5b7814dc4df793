import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { createUniverse, listUniversesComputed } from '$lib/server/db/universes';
import { universeCreate } from '$lib/schemas/universe';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ universes: listUniversesComputed(projectId) });
});

export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, universeCreate);
	return json(createUniverse(projectId, user.id, input), { status: 201 });
});
