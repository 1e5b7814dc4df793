import { and, asc, eq, sql } from 'drizzle-orm';
import type { Member, Project } from '../../shapes';
import { db, prepared } from './index';
import { recordAudit } from './audit';
import { NotFoundError, StaleVersionError } from '../errors';
import { removeProjectFiles } from './photos';
import { fixtures, invitations, memberships, projects, uploads, users, type Role } from './schema';

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

const projectById = prepared((database) =>
	database
		.select()
		.from(projects)
		.where(eq(projects.id, sql.placeholder('id')))
		.prepare()
);

export function getProject(id: number): ProjectRow | undefined {
	return projectById().get({ id });
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
		const before = getProject(projectId);
		if (!before) throw new NotFoundError('No such project.');
		const { version, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(projectShape(before));
		const after = db()
			.update(projects)
			.set({ ...fields, version: before.version + 1, updatedAt: new Date() })
			.where(and(eq(projects.id, projectId), eq(projects.version, version)))
			.returning()
			.get();
		// another writer took this version between our read and our write
		if (!after) throw new StaleVersionError(projectShape(getProject(projectId)!));
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

/**
 * Everything the project owns goes in one transaction. Fixtures go first: they point at types,
 * modes, universes, receivers and each other with RESTRICT (a single fixture delete must refuse),
 * so the cascade from the project alone would trip them. Photo files go after the commit.
 */
export function deleteProject(projectId: number, userId: string): void {
	const files = db().transaction((tx) => {
		const before = getProject(projectId);
		if (!before) throw new NotFoundError('No such project.');
		const stored = tx
			.select({ storedName: uploads.storedName })
			.from(uploads)
			.where(eq(uploads.projectId, projectId))
			.all()
			.map((u) => u.storedName);
		tx.update(fixtures).set({ leaderId: null }).where(eq(fixtures.projectId, projectId)).run();
		tx.delete(fixtures).where(eq(fixtures.projectId, projectId)).run();
		// universes, types → modes → channels, receivers → labels, revisions, review links, sign-offs,
		// memberships, invitations, uploads and the project's audit rows follow by ON DELETE CASCADE
		tx.delete(projects).where(eq(projects.id, projectId)).run();
		// the trail of the delete itself outlives the project (no project_id, or the cascade would take it)
		recordAudit({
			projectId: null,
			userId,
			action: 'project.delete',
			entity: 'project',
			entityId: projectId,
			before: { name: before.name, photos: stored.length }
		});
		return stored;
	});
	removeProjectFiles(projectId, files);
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
