import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { memberInvite, memberPatch } from '$lib/schemas/project';
import { requireRole } from '$lib/server/authz';
import {
	changeMemberRole,
	handOver,
	pendingInvitations,
	removeProjectMember,
	revokeInvitation
} from '$lib/server/db/members';
import { listMembers } from '$lib/server/db/projects';
import { action, formValues, parseWith } from '$lib/server/forms';
import { inviteMember, resendInvitation } from '$lib/server/invitations';
import { failedMailForProject, resendFailedMail } from '$lib/server/mail/outbox';
import type { Actions, PageServerLoad } from './$types';

const userIdField = z.object({ userId: z.string().min(1).max(100) });
const idField = z.object({ id: z.coerce.number().int().positive() });

export const load: PageServerLoad = (event) => {
	const { projectId, role, user } = requireRole(event, event.params.id, 'viewer');
	const owner = role === 'owner';
	return {
		members: listMembers(projectId),
		me: user.id,
		canManage: owner,
		invitations: owner ? pendingInvitations(projectId) : [],
		failedMail: owner
			? failedMailForProject(projectId).map((m) => ({ ...m, createdAt: m.createdAt.toISOString() }))
			: []
	};
};

const back = (id: string) => redirect(303, `/projects/${id}/members`);

export const actions: Actions = {
	invite: action('invite', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const { email, role } = parseWith(memberInvite, formValues(form));
		inviteMember({ projectId, email, role, invitedBy: user });
		return { done: `Invitation mailed to ${email}. They join once they accept it.` };
	}),
	role: action('role', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const { userId } = parseWith(userIdField, formValues(form));
		const { role } = parseWith(memberPatch, { role: form.get('role') });
		changeMemberRole(projectId, user.id, userId, role);
		back(event.params.id);
	}),
	remove: action('remove', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const { userId } = parseWith(userIdField, formValues(form));
		removeProjectMember(projectId, user.id, userId);
		back(event.params.id);
	}),
	handover: action('handover', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const { userId } = parseWith(userIdField, formValues(form));
		handOver(projectId, user.id, userId);
		back(event.params.id);
	}),
	resend: action('resend', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const { id } = parseWith(idField, formValues(form));
		const sent = resendInvitation(projectId, id, user);
		return { done: `A new invitation link went to ${sent.email}; the old link no longer works.` };
	}),
	revoke: action('revoke', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const { id } = parseWith(idField, formValues(form));
		revokeInvitation(projectId, user.id, id);
		back(event.params.id);
	}),
	resendMail: action('resendMail', (event, form) => {
		const { projectId } = requireRole(event, event.params.id, 'owner');
		const { id } = parseWith(idField, formValues(form));
		resendFailedMail(projectId, id);
		return { done: 'The message is queued again and will be retried for another 48 hours.' };
	})
};
