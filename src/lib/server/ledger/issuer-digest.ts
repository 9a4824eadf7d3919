/**
 * How an issue entry binds its issuer without naming the account (ledger-roles.ts): SHA-256 of
 * `rankseal-issuer:<salt>:<account id>`, with 16 random bytes of salt per entry, so that two
 * entries of the same issuer cannot be matched by their digests. `ledger:verify` recomputes it from
 * the certificate row; no issuer (a row without one) is the digest null.
 */
import { randomBytes } from 'node:crypto';
import { sha256Hex } from '../../evidence/hash';

export function issuerDigest(salt: string, accountId: string | null): string | null {
	return accountId === null ? null : sha256Hex(`rankseal-issuer:${salt}:${accountId}`);
}

export function newIssuerSalt(): string {
	return randomBytes(16).toString('hex');
}
