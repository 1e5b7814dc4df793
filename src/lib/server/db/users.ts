import { and, eq, gt, isNull, sql } from 'drizzle-orm';
import { now } from '../clock';
import { InvalidError, RefusedError } from '../errors';
import { hashToken, newToken } from '../tokens';
import { db } from './index';
import { accountTokens, memberships, projects, revokedSessions, users } from './schema';

export function normaliseEmail(email: string): string {
	return email.trim().toLowerCase();
}

export function findUserByEmail(email: string) {
	return db()
		.select()
		.from(users)
		.where(eq(users.email, normaliseEmail(email)))
		.get();
}

export function findUserById(id: string) {
	return db().select().from(users).where(eq(users.id, id)).get();
}

// ── Sessions the server can end ─────────────────────────────────────────────

const sessionCheck = () =>
	db()
		.select({
			generation: users.sessionGeneration,
			email: users.email,
			name: users.name,
			revoked: sql<
				number | null
			>`(select 1 from ${revokedSessions} where ${revokedSessions.sid} = ${sql.placeholder('sid')})`
		})
		.from(users)
		.where(eq(users.id, sql.placeholder('id')))
		.prepare();
let preparedCheck: ReturnType<typeof sessionCheck> | undefined;
let preparedFor: unknown;

/**
 * One indexed read per request (both lookups are primary keys): the user's current session
 * generation and whether this one session was signed out. Undefined when the user is gone.
 */
export function sessionState(userId: string, sid: string) {
	const database = db();
	if (preparedFor !== database) {
		preparedCheck = sessionCheck();
		preparedFor = database;
	}
	return preparedCheck!.get({ id: userId, sid });
}

export function revokeSession(sid: string, expiresAt: Date): void {
	db().insert(revokedSessions).values({ sid, expiresAt }).onConflictDoNothing().run();
}

/** Ends every session of the user at their next request. */
export function endAllSessions(userId: string): void {
	db()
		.update(users)
		.set({ sessionGeneration: sql`${users.sessionGeneration} + 1` })
		.where(eq(users.id, userId))
		.run();
}

export function purgeRevokedSessions(): void {
	db()
		.delete(revokedSessions)
		.where(sql`${revokedSessions.expiresAt} < ${now()}`)
		.run();
}

// ── Mailbox proof: sign-up and password links ───────────────────────────────

const SIGNUP_TTL_MS = 24 * 3_600_000;
const PASSWORD_TTL_MS = 3_600_000;

/** A single-use link; only its hash is stored. Returns the token to mail. */
export function createAccountToken(input: {
	email: string;
	purpose: 'signup' | 'password';
	name?: string;
	passwordHash?: string;
}): string {
	const token = newToken();
	const at = now();
	db()
		.insert(accountTokens)
		.values({
			email: normaliseEmail(input.email),
			purpose: input.purpose,
			tokenHash: hashToken(token),
			name: input.name ?? null,
			passwordHash: input.passwordHash ?? null,
			createdAt: new Date(at),
			expiresAt: new Date(at + (input.purpose === 'signup' ? SIGNUP_TTL_MS : PASSWORD_TTL_MS))
		})
		.run();
	return token;
}

/** The unused, unexpired token row, or undefined. */
export function findAccountToken(token: string) {
	return db()
		.select()
		.from(accountTokens)
		.where(
			and(
				eq(accountTokens.tokenHash, hashToken(token)),
				isNull(accountTokens.usedAt),
				gt(accountTokens.expiresAt, new Date(now()))
			)
		)
		.get();
}

const LINK_USED = 'This link has expired or was already used. Ask for a new one.';

/**
 * Confirms a sign-up link: the mailbox is proven, so the account is made (verified) with the
 * name and password chosen at sign-up. If an account appeared meanwhile (a sign-in link), the
 * proven mailbox may set its password, as a password link would.
 */
export function confirmSignUp(token: string): { email: string } {
	return db().transaction((tx) => {
		const row = findAccountToken(token);
		if (!row || row.purpose !== 'signup') throw new InvalidError(LINK_USED);
		tx.update(accountTokens)
			.set({ usedAt: new Date(now()) })
			.where(eq(accountTokens.id, row.id))
			.run();
		const existing = findUserByEmail(row.email);
		if (existing) {
			tx.update(users)
				.set({
					passwordHash: row.passwordHash,
					emailVerified: existing.emailVerified ?? new Date(now()),
					sessionGeneration: sql`${users.sessionGeneration} + 1`
				})
				.where(eq(users.id, existing.id))
				.run();
		} else {
			tx.insert(users)
				.values({ email: row.email, name: row.name, passwordHash: row.passwordHash, emailVerified: new Date(now()) })
				.run();
		}
		// other outstanding links for this address are spent too
		tx.update(accountTokens)
			.set({ usedAt: new Date(now()) })
			.where(and(eq(accountTokens.email, row.email), isNull(accountTokens.usedAt)))
			.run();
		return { email: row.email };
	});
}

/** Sets a password through a mailed link; ends every session (a thief's included). */
export function setPasswordByToken(token: string, passwordHash: string): { email: string } {
	return db().transaction((tx) => {
		const row = findAccountToken(token);
		if (!row || row.purpose !== 'password') throw new InvalidError(LINK_USED);
		const user = findUserByEmail(row.email);
		if (!user) throw new InvalidError(LINK_USED);
		tx.update(users)
			.set({
				passwordHash,
				emailVerified: user.emailVerified ?? new Date(now()),
				sessionGeneration: sql`${users.sessionGeneration} + 1`
			})
			.where(eq(users.id, user.id))
			.run();
		tx.update(accountTokens)
			.set({ usedAt: new Date(now()) })
			.where(and(eq(accountTokens.email, row.email), isNull(accountTokens.usedAt)))
			.run();
		return { email: row.email };
	});
}

export function setPassword(userId: string, passwordHash: string): void {
	db()
		.update(users)
		.set({ passwordHash, sessionGeneration: sql`${users.sessionGeneration} + 1` })
		.where(eq(users.id, userId))
		.run();
}

export function renameUser(userId: string, name: string): void {
	db().update(users).set({ name }).where(eq(users.id, userId)).run();
}

/** Projects where this user is the only owner: the account cannot go before someone takes them over. */
export function soleOwnedProjects(userId: string): { id: number; name: string }[] {
	return db()
		.select({ id: projects.id, name: projects.name })
		.from(memberships)
		.innerJoin(projects, eq(projects.id, memberships.projectId))
		.where(
			and(
				eq(memberships.userId, userId),
				eq(memberships.role, 'owner'),
				sql`(select count(*) from ${memberships} m2 where m2.project_id = ${memberships.projectId} and m2.role = 'owner') = 1`
			)
		)
		.all();
}

/** Removes the account (memberships go with it); refused while it alone owns a project. */
export function deleteUser(userId: string): void {
	db().transaction((tx) => {
		const sole = soleOwnedProjects(userId);
		if (sole.length) {
			throw new RefusedError(
				`You are the only owner of ${sole.map((p) => `“${p.name}”`).join(', ')}. Make someone else owner there first (crew page), or delete the project.`
			);
		}
		tx.delete(accountTokens)
			.where(eq(accountTokens.email, findUserById(userId)?.email ?? ''))
			.run();
		tx.delete(users).where(eq(users.id, userId)).run();
	});
}
