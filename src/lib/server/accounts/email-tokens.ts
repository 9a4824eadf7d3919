/**
 * Single-use, expiring links sent by e-mail (address confirmation, password reset). Only the
 * SHA-256 of a token is stored; using one is a single conditional UPDATE, so it works once.
 */
import { Op, type Transaction } from 'sequelize';
import type { Database } from '../db';
import type { EmailTokenPurpose } from '../db/models/EmailToken';
import { hashSecret, newId, newSecret } from '../core/ids';

export const VERIFY_EMAIL_TTL_MS = 24 * 60 * 60 * 1000;
export const RESET_PASSWORD_TTL_MS = 60 * 60 * 1000;

export type TokenState = 'valid' | 'used' | 'expired' | 'unknown';

/** Issues a new token and retires the user's earlier unused ones of the same purpose. */
export async function issueEmailToken(
	database: Database,
	userId: string,
	purpose: EmailTokenPurpose,
	ttlMs: number,
	transaction?: Transaction
): Promise<string> {
	const { EmailToken } = database.models;
	const now = new Date();
	await EmailToken.update(
		{ usedAt: now },
		{ where: { userId, purpose, usedAt: null }, transaction }
	);
	const { token, hash } = newSecret();
	const expiresAt = new Date(now.getTime() + ttlMs);
	await EmailToken.create(
		{ id: newId(), userId, purpose, tokenHash: hash, expiresAt },
		{ transaction }
	);
	return token;
}

/** What a token is, without using it (for pages that show a form before acting). */
export async function emailTokenState(
	database: Database,
	token: string,
	purpose: EmailTokenPurpose,
	transaction?: Transaction
): Promise<{ state: TokenState; userId: string | null }> {
	const row = await database.models.EmailToken.findOne({
		where: { tokenHash: hashSecret(token), purpose },
		transaction
	});
	if (!row) return { state: 'unknown', userId: null };
	const { usedAt, expiresAt, userId } = row.get({ plain: true });
	if (usedAt) return { state: 'used', userId };
	if (new Date(expiresAt).getTime() <= Date.now()) return { state: 'expired', userId };
	return { state: 'valid', userId };
}

/** Marks the token used if it is valid; returns its user, or why it could not be used. */
export async function useEmailToken(
	database: Database,
	token: string,
	purpose: EmailTokenPurpose,
	transaction?: Transaction
): Promise<{ ok: true; userId: string } | { ok: false; reason: Exclude<TokenState, 'valid'> }> {
	const { EmailToken } = database.models;
	const now = new Date();
	const tokenHash = hashSecret(token);
	const [changed] = await EmailToken.update(
		{ usedAt: now },
		{ where: { tokenHash, purpose, usedAt: null, expiresAt: { [Op.gt]: now } }, transaction }
	);
	const { state, userId } = await emailTokenState(database, token, purpose, transaction);
	if (changed === 1 && userId) return { ok: true, userId };
	return {
		ok: false,
		reason: state === 'valid' ? 'used' : state === 'unknown' ? 'unknown' : state
	};
}

/**
 * Marks the user's address as confirmed unless it already is; true when this call confirmed it.
 * Any proof of reading the mailbox counts: the confirmation link, a reset link, an invitation.
 */
export async function confirmAddress(
	database: Database,
	userId: string,
	transaction: Transaction
): Promise<boolean> {
	const [changed] = await database.models.User.update(
		{ emailVerifiedAt: new Date() },
		{ where: { id: userId, emailVerifiedAt: null }, transaction }
	);
	return changed === 1;
}
