import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { deleteProject, getProject, projectShape, updateProject } from '$lib/server/db/projects';
import { projectPatch } from '$lib/schemas/project';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId, role } = requireRole(event, event.params.pid, 'viewer');
	return json(projectShape(getProject(projectId)!, role));
});

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user, role } = requireRole(event, event.params.pid, 'programmer');
	const patch = await readJson(event, projectPatch);
	return json(projectShape(updateProject(projectId, user.id, patch), role));
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'owner');
	deleteProject(projectId, user.id);
	return new Response(null, { status: 204 });
});
