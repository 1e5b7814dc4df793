import { and, asc, eq, isNull, sql } from 'drizzle-orm';
import { now } from '../clock';
import { DuplicateError, ForbiddenError, GoneError, NotFoundError, RefusedError } from '../errors';
import { recordAudit } from './audit';
import { LRUCache } from 'lru-cache';
import { db, prepared } from './index';
import { invitations, memberships, projects, users, type Role } from './schema';

// Membership rules in one place, each change in one transaction: a project always keeps an owner,
// and nobody becomes a member except by accepting an invitation with a verified address.

/** 409 `last-owner`, the code the API has always answered for this rule. */
const lastOwner = () =>
	new RefusedError('A project needs at least one owner: make someone else owner first.', { code: 'last-owner' });

const roleCheck = prepared((database) =>
	database
		.select({ role: memberships.role })
		.from(memberships)
		.innerJoin(projects, eq(projects.id, memberships.projectId))
		.where(
			and(eq(memberships.projectId, sql.placeholder('projectId')), eq(memberships.userId, sql.placeholder('userId')))
		)
		.prepare()
);

/** The caller's role in an existing project, or undefined (no such project, or not a member): every request's check. */
export function memberRole(projectId: number, userId: string): Role | undefined {
	return roleCheck().get({ projectId, userId })?.role;
}

// roles kept per database change state: a membership change is a write, which moves the state
const rolesAt = new LRUCache<string, { role: Role | undefined }>({ max: 5_000 });

/** memberRole as of a change state the caller has just read (a GET's session check): no read while nothing was written. */
export function memberRoleAt(state: string, projectId: number, userId: string): Role | undefined {
	const key = `${state}\n${projectId}\n${userId}`;
	const hit = rolesAt.get(key);
	if (hit) return hit.role;
	const role = memberRole(projectId, userId);
	rolesAt.set(key, { role });
	return role;
}

function roleOf(projectId: number, userId: string): Role {
	const row = db()
		.select({ role: memberships.role })
		.from(memberships)
		.where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)))
		.get();
	if (!row) throw new NotFoundError('No such member in this project.');
	return row.role;
}

function owners(projectId: number): number {
	return db()
		.select({ n: sql<number>`count(*)` })
		.from(memberships)
		.where(and(eq(memberships.projectId, projectId), eq(memberships.role, 'owner')))
		.get()!.n;
}

function setRole(projectId: number, userId: string, role: Role) {
	db()
		.update(memberships)
		.set({ role, version: sql`${memberships.version} + 1` })
		.where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)))
		.run();
}

export function changeMemberRole(projectId: number, byUserId: string, userId: string, role: Role): void {
	db().transaction(() => {
		const before = roleOf(projectId, userId);
		if (before === 'owner' && role !== 'owner' && owners(projectId) === 1) throw lastOwner();
		setRole(projectId, userId, role);
		recordAudit({
			projectId,
			userId: byUserId,
			action: 'member.update',
			entity: 'member',
			entityId: userId,
			before: { role: before },
			after: { role }
		});
	});
}

export function removeProjectMember(projectId: number, byUserId: string, userId: string): void {
	db().transaction(() => {
		const before = roleOf(projectId, userId);
		if (before === 'owner' && owners(projectId) === 1) throw lastOwner();
		db()
			.delete(memberships)
			.where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)))
			.run();
		recordAudit({
			projectId,
			userId: byUserId,
			action: 'member.remove',
			entity: 'member',
			entityId: userId,
			before: { role: before }
		});
	});
}

/** The owner hands the project to another member: they become owner, the giver programmer. */
export function handOver(projectId: number, fromUserId: string, toUserId: string): void {
	db().transaction(() => {
		if (fromUserId === toUserId) throw new RefusedError('Choose another member to hand the project to.');
		if (roleOf(projectId, fromUserId) !== 'owner') throw new ForbiddenError('Only an owner can hand a project over.');
		const before = roleOf(projectId, toUserId);
		setRole(projectId, toUserId, 'owner');
		setRole(projectId, fromUserId, 'programmer');
		recordAudit({
			projectId,
			userId: fromUserId,
			action: 'member.handover',
			entity: 'member',
			entityId: toUserId,
			before: { role: before },
			after: { role: 'owner', previousOwnerRole: 'programmer' }
		});
	});
}

export function isMemberByEmail(projectId: number, email: string): boolean {
	return !!db()
		.select({ id: users.id })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(and(eq(memberships.projectId, projectId), eq(users.email, email)))
		.get();
}

export function pendingInvitations(projectId: number) {
	return db()
		.select({
			id: invitations.id,
			email: invitations.email,
			role: invitations.role,
			createdAt: invitations.createdAt,
			expiresAt: invitations.expiresAt
		})
		.from(invitations)
		.where(and(eq(invitations.projectId, projectId), isNull(invitations.acceptedAt)))
		.orderBy(asc(invitations.email))
		.all()
		.map((i) => ({
			...i,
			createdAt: i.createdAt.toISOString(),
			expiresAt: i.expiresAt.toISOString(),
			expired: i.expiresAt.getTime() < now()
		}));
}

/** Writes (or renews) the one pending invitation of an address; the caller mails the token. */
export function storeInvitation(input: {
	projectId: number;
	email: string;
	role: Role;
	tokenHash: string;
	invitedBy: string;
	expiresAt: Date;
}) {
	return db().transaction(() => {
		if (isMemberByEmail(input.projectId, input.email)) {
			throw new DuplicateError(
				`${input.email} is already a member; change their role instead.`,
				[{ path: ['email'], message: 'Already a member of this project.' }],
				{ code: 'exists' }
			);
		}
		db()
			.delete(invitations)
			.where(
				and(
					eq(invitations.projectId, input.projectId),
					eq(invitations.email, input.email),
					isNull(invitations.acceptedAt)
				)
			)
			.run();
		const row = db().insert(invitations).values(input).returning().get();
		recordAudit({
			projectId: input.projectId,
			userId: input.invitedBy,
			action: 'member.invite',
			entity: 'invitation',
			entityId: row.id,
			after: { email: input.email, role: input.role }
		});
		return row;
	});
}

export function findPendingInvitation(projectId: number, id: number) {
	const row = db()
		.select()
		.from(invitations)
		.where(and(eq(invitations.id, id), eq(invitations.projectId, projectId), isNull(invitations.acceptedAt)))
		.get();
	if (!row) throw new NotFoundError('No pending invitation with that number in this project.');
	return row;
}

export function revokeInvitation(projectId: number, byUserId: string, id: number): void {
	db().transaction(() => {
		const row = findPendingInvitation(projectId, id);
		db().delete(invitations).where(eq(invitations.id, row.id)).run();
		recordAudit({
			projectId,
			userId: byUserId,
			action: 'member.revoke-invitation',
			entity: 'invitation',
			entityId: id,
			before: { email: row.email, role: row.role }
		});
	});
}

/**
 * The invitation is bound to an address and only a verified account of that address may take it;
 * a squatter who signed up with someone else's address never proved the mailbox.
 */
export function acceptInvitationRow(tokenHash: string, user: { id: string; email: string }) {
	return db().transaction(() => {
		const invitation = db().select().from(invitations).where(eq(invitations.tokenHash, tokenHash)).get();
		if (!invitation) throw new NotFoundError('This invitation link is not valid.');
		if (invitation.acceptedAt) throw new GoneError('This invitation was already used.');
		if (invitation.expiresAt.getTime() < now()) throw new GoneError('This invitation has expired.');
		if (invitation.email !== user.email.toLowerCase()) {
			throw new ForbiddenError(`This invitation is for ${invitation.email}; you are signed in as ${user.email}.`);
		}
		const account = db().select({ emailVerified: users.emailVerified }).from(users).where(eq(users.id, user.id)).get();
		if (!account?.emailVerified) {
			throw new ForbiddenError(
				'Confirm your e-mail address first: sign in with a link mailed to it, then open this invitation again.'
			);
		}
		db()
			.update(invitations)
			.set({ acceptedAt: new Date(now()) })
			.where(eq(invitations.id, invitation.id))
			.run();
		db()
			.insert(memberships)
			.values({ projectId: invitation.projectId, userId: user.id, role: invitation.role })
			.onConflictDoNothing()
			.run();
		recordAudit({
			projectId: invitation.projectId,
			userId: user.id,
			action: 'member.accept',
			entity: 'member',
			entityId: user.id,
			after: { role: invitation.role }
		});
		return invitation;
	});
}
