import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { DuplicateError } from '$lib/server/errors';
import { requireRole } from '$lib/server/authz';
import { addMember, listMembers, memberRole } from '$lib/server/db/projects';
import { findUserByEmail } from '$lib/server/db/users';
import { recordAudit } from '$lib/server/db/audit';
import { inviteMember } from '$lib/server/invitations';
import { memberInvite } from '$lib/schemas/project';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ members: listMembers(projectId) });
});

/**
 * Adds a member by e-mail. An existing account joins at once; anyone else
 * gets an invitation link by mail. Either way the answer is 201.
 */
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'owner');
	const { email, role } = await readJson(event, memberInvite);
	const existing = findUserByEmail(email);
	if (existing && !memberRole(projectId, existing.id)) {
		addMember(projectId, existing.id, role);
		recordAudit({
			projectId,
			userId: user.id,
			action: 'member.add',
			entity: 'member',
			entityId: existing.id,
			after: { email, role }
		});
		const member = listMembers(projectId).find((m) => m.userId === existing.id);
		return json({ status: 'member', ...member }, { status: 201 });
	}
	if (existing) {
		throw new DuplicateError(`${email} is already a member; change their role instead.`, undefined, { code: 'exists' });
	}
	const invitation = await inviteMember({ projectId, email, role, invitedBy: user });
	return json({ status: 'invited', ...invitation }, { status: 201 });
});
