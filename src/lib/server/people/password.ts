import { hash, verify } from '@node-rs/argon2';

/**
 * argon2id with the OWASP Password Storage Cheat Sheet's first recommended setting:
 * m = 19 MiB, t = 2, p = 1.
 */
const ARGON2_OPTIONS = { memoryCost: 19456, timeCost: 2, outputLen: 32, parallelism: 1 } as const;

/** Hashes a password with argon2id (the library's default algorithm). */
export function hashPassword(password: string): Promise<string> {
	return hash(password, ARGON2_OPTIONS);
}

/** Checks a password against a stored argon2 hash; false on any mismatch or malformed hash. */
export async function verifyPassword(storedHash: string, password: string): Promise<boolean> {
	try {
		return await verify(storedHash, password);
	} catch {
		return false;
	}
}
