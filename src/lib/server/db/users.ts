import { eq } from 'drizzle-orm';
import { hashPassword } from '../auth/password';
import { db } from './index';
import { users } from './schema';

export function findUserByEmail(email: string) {
	return db().select().from(users).where(eq(users.email, email.trim().toLowerCase())).get();
}

export function findUserById(id: string) {
	return db().select().from(users).where(eq(users.id, id)).get();
}

export class EmailTakenError extends Error {}

/** Creates an account with a password; refuses an e-mail already in use. */
export async function createUser(input: { email: string; name: string; password: string }) {
	const email = input.email.trim().toLowerCase();
	const passwordHash = await hashPassword(input.password);
	const existing = findUserByEmail(email);
	if (existing?.passwordHash) throw new EmailTakenError(email);
	if (existing) {
		// an account first made by an e-mailed link may add a password later
		return db()
			.update(users)
			.set({ passwordHash, name: existing.name || input.name })
			.where(eq(users.id, existing.id))
			.returning()
			.get();
	}
	return db().insert(users).values({ email, name: input.name, passwordHash }).returning().get();
}
