import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireUser } from '$lib/server/authz';
import { createProject, listProjectsForUser, projectShape } from '$lib/server/db/projects';
import { projectCreate } from '$lib/schemas/project';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const user = requireUser(event);
	return json({ projects: listProjectsForUser(user.id) });
});

export const POST: RequestHandler = api(async (event) => {
	const user = requireUser(event);
	const input = await readJson(event, projectCreate);
	const project = createProject(user.id, input);
	return json(projectShape(project, 'owner'), { status: 201 });
});
