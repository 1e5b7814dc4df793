import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { changeMemberRole, removeProjectMember } from '$lib/server/db/members';
import { listMembers } from '$lib/server/db/projects';
import { memberPatch } from '$lib/schemas/project';
import type { RequestHandler } from './$types';

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'owner');
	const { role } = await readJson(event, memberPatch);
	changeMemberRole(projectId, user.id, event.params.userId, role);
	return json(listMembers(projectId).find((m) => m.userId === event.params.userId));
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'owner');
	removeProjectMember(projectId, user.id, event.params.userId);
	return new Response(null, { status: 204 });
});
