import { eq } from 'drizzle-orm';
import { publicBaseUrl } from './config';
import { db } from './db/index';
import { addMember, findInvitationByHash, getProject } from './db/projects';
import { auditLog, invitations, type Role } from './db/schema';
import { sendMail } from './mail/outbox';
import { invitationMail } from './mail/templates';
import { hashToken, newToken } from './tokens';

const INVITATION_DAYS = 14;

export async function inviteMember(input: {
	projectId: number;
	email: string;
	role: Role;
	invitedBy: { id: string; name: string | null; email: string };
}) {
	const project = getProject(input.projectId);
	if (!project) throw new Error('project vanished');
	const token = newToken();
	const email = input.email.trim().toLowerCase();
	const row = db()
		.insert(invitations)
		.values({
			projectId: input.projectId,
			email,
			role: input.role,
			tokenHash: hashToken(token),
			invitedBy: input.invitedBy.id,
			expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000)
		})
		.returning()
		.get();
	db()
		.insert(auditLog)
		.values({
			projectId: input.projectId,
			userId: input.invitedBy.id,
			action: 'member.invite',
			entity: 'invitation',
			entityId: String(row.id),
			after: { email, role: input.role }
		})
		.run();
	const url = `${publicBaseUrl()}/invite/${token}`;
	const mailed = await sendMail(
		invitationMail(email, project.name, input.role, input.invitedBy.name || input.invitedBy.email, url)
	);
	return { id: row.id, email, role: input.role, expiresAt: row.expiresAt.toISOString(), mailed };
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

/** The invitation is bound to an e-mail address: only that account may use it. */
export function acceptInvitation(token: string, user: { id: string; email: string }): InvitationCheck {
	const check = checkInvitation(token);
	if (!check.ok) return check;
	if (check.invitation.email !== user.email.toLowerCase()) {
		return {
			ok: false,
			reason: `This invitation is for ${check.invitation.email}; you are signed in as ${user.email}.`
		};
	}
	db().transaction((tx) => {
		tx.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, check.invitation.id)).run();
		// same connection, so this joins the transaction (better-sqlite3 is synchronous)
		addMember(check.invitation.projectId, user.id, check.invitation.role);
	});
	return check;
}
