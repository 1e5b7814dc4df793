import { hash } from '@node-rs/argon2';
import type { Db } from '../../src/lib/server/db/index';
import type { Client } from './server';
import { memberships, projects, users, type Role } from '../../src/lib/server/db/schema';

// Test data, written straight into the server's database file.

export const PASSWORD = 'correct horse battery';
let passwordHash: Promise<string> | undefined;
let counter = 0;

export function uniqueEmail(prefix = 'user'): string {
	return `${prefix}-${process.pid}-${++counter}-${Date.now().toString(36)}@test.example`;
}

export async function makeUser(db: Db, overrides: { email?: string; name?: string; verified?: boolean } = {}) {
	passwordHash ??= hash(PASSWORD);
	return db
		.insert(users)
		.values({
			email: overrides.email ?? uniqueEmail(),
			name: overrides.name ?? 'Test Person',
			passwordHash: await passwordHash,
			// as if the mailbox had been proven by the sign-up link
			emailVerified: overrides.verified === false ? null : new Date()
		})
		.returning()
		.get();
}

export function makeProject(db: Db, overrides: Partial<typeof projects.$inferInsert> = {}) {
	return db
		.insert(projects)
		.values({ name: `Test project ${++counter}`, ...overrides })
		.returning()
		.get();
}

export function addMember(db: Db, projectId: number, userId: string, role: Role) {
	db.insert(memberships).values({ projectId, userId, role }).run();
}

/** A project with one member per role; returns their e-mails. */
export async function makeCrew(db: Db) {
	const project = makeProject(db);
	const crew = {} as Record<Role, { id: string; email: string }>;
	for (const role of ['owner', 'programmer', 'electrician', 'viewer'] as const) {
		const user = await makeUser(db, { email: uniqueEmail(role) });
		addMember(db, project.id, user.id, role);
		crew[role] = { id: user.id, email: user.email! };
	}
	const outsider = await makeUser(db, { email: uniqueEmail('outsider') });
	return { project, crew, outsider: { id: outsider.id, email: outsider.email! } };
}

/** A signed-in client per crew role and for the outsider of a makeCrew() project. */
export async function signInCrew(
	server: { signIn(email: string, password?: string): Promise<Client> },
	crew: Record<Role, { email: string }>,
	outsider: { email: string }
): Promise<Record<Role | 'outsider', Client>> {
	const clients = {} as Record<Role | 'outsider', Client>;
	for (const role of ['owner', 'programmer', 'electrician', 'viewer'] as const)
		clients[role] = await server.signIn(crew[role].email, PASSWORD);
	clients.outsider = await server.signIn(outsider.email, PASSWORD);
	return clients;
}
