import { json } from '@sveltejs/kit';
import { api, ApiError, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { recordAudit } from '$lib/server/db/audit';
import { listMembers, memberRole, ownerCount, removeMember, setMemberRole } from '$lib/server/db/projects';
import { memberPatch } from '$lib/schemas/project';
import type { RequestHandler } from './$types';

function target(projectId: number, userId: string) {
	const role = memberRole(projectId, userId);
	if (!role) throw new ApiError(404, 'No such member in this project.');
	return role;
}

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'owner');
	const { role } = await readJson(event, memberPatch);
	const before = target(projectId, event.params.userId);
	if (before === 'owner' && role !== 'owner' && ownerCount(projectId) === 1) {
		throw new ApiError(409, 'A project needs at least one owner: make someone else owner first.', {
			code: 'last-owner'
		});
	}
	setMemberRole(projectId, event.params.userId, role);
	recordAudit({
		projectId,
		userId: user.id,
		action: 'member.update',
		entity: 'member',
		entityId: event.params.userId,
		before: { role: before },
		after: { role }
	});
	return json(listMembers(projectId).find((m) => m.userId === event.params.userId));
});

export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'owner');
	const before = target(projectId, event.params.userId);
	if (before === 'owner' && ownerCount(projectId) === 1) {
		throw new ApiError(409, 'A project needs at least one owner: make someone else owner first.', {
			code: 'last-owner'
		});
	}
	removeMember(projectId, event.params.userId);
	recordAudit({
		projectId,
		userId: user.id,
		action: 'member.remove',
		entity: 'member',
		entityId: event.params.userId,
		before: { role: before }
	});
	return new Response(null, { status: 204 });
});
