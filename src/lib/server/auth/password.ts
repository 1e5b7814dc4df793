import { hash, verify } from '@node-rs/argon2';

// argon2id with the library's defaults (OWASP-recommended memory cost).
export function hashPassword(password: string): Promise<string> {
	return hash(password);
}

export async function verifyPassword(stored: string | null, password: string): Promise<boolean> {
	if (!stored) return false;
	try {
		return await verify(stored, password);
	} catch {
		return false;
	}
}

let dummy: Promise<string> | undefined;

/** The same argon2 work as a real check, for addresses with no account or no password. Always false. */
export async function verifyAgainstDummy(password: string): Promise<false> {
	dummy ??= hash('no account has this password, it only spends the same time');
	await verifyPassword(await dummy, password);
	return false;
}
