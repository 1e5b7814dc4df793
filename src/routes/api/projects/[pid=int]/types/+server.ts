import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { listTypes } from '$lib/server/db/patch';
import { createType } from '$lib/server/db/fixture-types';
import { typeCreate } from '$lib/schemas/type';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ types: listTypes(projectId) });
});

export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, typeCreate);
	return json(createType(projectId, user.id, input), { status: 201 });
});
