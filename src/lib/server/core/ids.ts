/** Identifiers and secrets: random ids for rows, random tokens for links, stored only as SHA-256. */
import { randomBytes, randomUUID } from 'node:crypto';
import { sha256Hex } from '$lib/evidence/hash';

export const newId = (): string => randomUUID();

/** A URL-safe secret of 32 random bytes and the SHA-256 hex that is stored instead of it. */
export function newSecret(prefix = ''): { token: string; hash: string } {
	const token = prefix + randomBytes(32).toString('base64url');
	return { token, hash: sha256Hex(token) };
}

export const hashSecret = (token: string): string => sha256Hex(token);
