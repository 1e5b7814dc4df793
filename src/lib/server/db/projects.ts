import { and, asc, eq, sql } from 'drizzle-orm';
import type { Member, Project } from '../../shapes';
import { db } from './index';
import { recordAudit } from './audit';
import { StaleVersionError } from './errors';
import { invitations, memberships, projects, users, type Role } from './schema';

export type ProjectRow = typeof projects.$inferSelect;

export function projectShape(p: ProjectRow, role?: Role): Project {
	return {
		id: p.id,
		name: p.name,
		venue: p.venue,
		startsOn: p.startsOn,
		endsOn: p.endsOn,
		notes: p.notes,
		artnetOffset: p.artnetOffset,
		version: p.version,
		createdAt: p.createdAt.toISOString(),
		updatedAt: p.updatedAt.toISOString(),
		...(role ? { role } : {})
	};
}
export type { Project };

export function listProjectsForUser(userId: string): Project[] {
	return db()
		.select({ project: projects, role: memberships.role })
		.from(memberships)
		.innerJoin(projects, eq(projects.id, memberships.projectId))
		.where(eq(memberships.userId, userId))
		.orderBy(asc(projects.name), asc(projects.id))
		.all()
		.map((r) => projectShape(r.project, r.role));
}

export function getProject(id: number): ProjectRow | undefined {
	return db().select().from(projects).where(eq(projects.id, id)).get();
}

export interface NewProject {
	name: string;
	venue?: string;
	startsOn?: string | null;
	endsOn?: string | null;
	notes?: string;
	artnetOffset?: number;
}

/** Creating a project makes its creator the owner, in one transaction. */
export function createProject(userId: string, input: NewProject): ProjectRow {
	return db().transaction((tx) => {
		const project = tx.insert(projects).values(input).returning().get();
		tx.insert(memberships).values({ projectId: project.id, userId, role: 'owner' }).run();
		recordAudit({
			projectId: project.id,
			userId,
			action: 'project.create',
			entity: 'project',
			entityId: project.id,
			after: projectShape(project)
		});
		return project;
	});
}

export function listMembers(projectId: number): Member[] {
	return db()
		.select({
			userId: users.id,
			email: users.email,
			name: users.name,
			role: memberships.role,
			version: memberships.version,
			since: memberships.createdAt
		})
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(eq(memberships.projectId, projectId))
		.orderBy(asc(users.email))
		.all()
		.map((m) => ({ ...m, since: m.since.toISOString() }));
}

export function addMember(projectId: number, userId: string, role: Role) {
	db()
		.insert(memberships)
		.values({ projectId, userId, role })
		.onConflictDoUpdate({
			target: [memberships.projectId, memberships.userId],
			set: { role, version: sql`${memberships.version} + 1` }
		})
		.run();
}

export function findInvitationByHash(tokenHash: string) {
	return db().select().from(invitations).where(eq(invitations.tokenHash, tokenHash)).get();
}

export function listInvitations(projectId: number) {
	return db()
		.select()
		.from(invitations)
		.where(and(eq(invitations.projectId, projectId)))
		.orderBy(asc(invitations.createdAt))
		.all();
}

export function updateProject(
	projectId: number,
	userId: string,
	patch: Partial<NewProject> & { version: number }
): ProjectRow {
	return db().transaction(() => {
		const before = getProject(projectId)!;
		const { version, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(projectShape(before));
		const after = db()
			.update(projects)
			.set({ ...fields, version: before.version + 1, updatedAt: new Date() })
			.where(and(eq(projects.id, projectId), eq(projects.version, version)))
			.returning()
			.get();
		recordAudit({
			projectId,
			userId,
			action: 'project.update',
			entity: 'project',
			entityId: projectId,
			before: projectShape(before),
			after: projectShape(after)
		});
		return after;
	});
}

export function deleteProject(projectId: number): void {
	db().delete(projects).where(eq(projects.id, projectId)).run();
}

export function memberRole(projectId: number, userId: string): Role | undefined {
	return db()
		.select({ role: memberships.role })
		.from(memberships)
		.where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)))
		.get()?.role;
}

export function ownerCount(projectId: number): number {
	return db()
		.select({ n: sql<number>`count(*)` })
		.from(memberships)
		.where(and(eq(memberships.projectId, projectId), eq(memberships.role, 'owner')))
		.get()!.n;
}

export function setMemberRole(projectId: number, userId: string, role: Role): void {
	db()
		.update(memberships)
		.set({ role, version: sql`${memberships.version} + 1` })
		.where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)))
		.run();
}

export function removeMember(projectId: number, userId: string): void {
	db()
		.delete(memberships)
		.where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)))
		.run();
}
