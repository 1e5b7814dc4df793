import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { listMembers } from '$lib/server/db/projects';
import { inviteMember } from '$lib/server/invitations';
import { memberInvite } from '$lib/schemas/project';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ members: listMembers(projectId) });
});

/**
 * Adds a member by e-mail — always as an invitation mailed to that address, which its owner
 * accepts after signing in with the verified address. An account that merely exists under
 * that address (anyone can type one in) is never made a member by this call.
 */
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'owner');
	const { email, role } = await readJson(event, memberInvite);
	const invitation = inviteMember({ projectId, email, role, invitedBy: user });
	return json({ status: 'invited', ...invitation }, { status: 201 });
});
