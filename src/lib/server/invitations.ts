import { publicBaseUrl } from './config';
import { findInvitationByHash, getProject } from './db/projects';
import { acceptInvitationRow, findPendingInvitation, storeInvitation } from './db/members';
import type { Role } from './db/schema';
import { NotFoundError } from './errors';
import { queueMail } from './mail/outbox';
import { invitationMail } from './mail/templates';
import { memberMailByAddress, memberMailBySender, throttle } from './ratelimit';
import { hashToken, newToken } from './tokens';

const INVITATION_DAYS = 14;

/** Every new member comes in this way: an invitation mailed to the address, accepted by its owner. */
export function inviteMember(input: {
	projectId: number;
	email: string;
	role: Role;
	invitedBy: { id: string; name: string | null; email: string };
}) {
	const project = getProject(input.projectId);
	if (!project) throw new NotFoundError('No such project.');
	const email = input.email.trim().toLowerCase();
	throttle('invitations', [
		[memberMailBySender, input.invitedBy.id],
		[memberMailByAddress, email]
	]);
	const token = newToken();
	const row = storeInvitation({
		projectId: input.projectId,
		email,
		role: input.role,
		tokenHash: hashToken(token),
		invitedBy: input.invitedBy.id,
		expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000)
	});
	const url = `${publicBaseUrl()}/invite/${token}`;
	queueMail(invitationMail(email, project.name, input.role, input.invitedBy.email, url), {
		projectId: input.projectId,
		kind: 'invitation'
	});
	return { id: row.id, email, role: input.role, expiresAt: row.expiresAt.toISOString(), mailed: true };
}

/** A fresh link for a pending invitation (the old one stops working). */
export function resendInvitation(
	projectId: number,
	id: number,
	by: { id: string; name: string | null; email: string }
) {
	const row = findPendingInvitation(projectId, id);
	return inviteMember({ projectId, email: row.email, role: row.role, invitedBy: by });
}

export type InvitationCheck =
	| { ok: true; invitation: NonNullable<ReturnType<typeof findInvitationByHash>>; projectName: string }
	| { ok: false; reason: string };

export function checkInvitation(token: string): InvitationCheck {
	const invitation = findInvitationByHash(hashToken(token));
	if (!invitation) return { ok: false, reason: 'This invitation link is not valid.' };
	if (invitation.acceptedAt) return { ok: false, reason: 'This invitation was already used.' };
	if (invitation.expiresAt.getTime() < Date.now()) return { ok: false, reason: 'This invitation has expired.' };
	const project = getProject(invitation.projectId);
	if (!project) return { ok: false, reason: 'This invitation link is not valid.' };
	return { ok: true, invitation, projectName: project.name };
}

/** Throws a domain error when the signed-in user may not take this invitation. */
export function acceptInvitation(token: string, user: { id: string; email: string }) {
	return acceptInvitationRow(hashToken(token), user);
}
