/**
 * API tokens for scripts: `rks_` + 32 random bytes, shown once and stored as SHA-256. A token
 * acts as its user; group leads issue them (product.md), anyone may revoke their own.
 */
import { Op } from 'sequelize';
import { z } from 'zod';
import type { SessionUser } from '../auth';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ApiTokenAttributes } from '../db/models/ApiToken';
import { membershipsOf } from './access';
import { audit } from './audit';
import { ForbiddenError, NotFoundError } from './errors';
import { hashSecret, newId, newSecret } from './ids';

export const TOKEN_PREFIX = 'rks_';
/** lastUsedAt is refreshed at most this often, so that busy scripts do not write on every call. */
const LAST_USED_RESOLUTION_MS = 60_000;

export const tokenNameSchema = z.object({
	name: z
		.string({ error: 'Name the token.' })
		.trim()
		.min(1, 'Name the token.')
		.max(80, 'Keep the name under 80 characters.')
});

export interface TokenView {
	id: string;
	name: string;
	prefix: string;
	createdAt: string;
	lastUsedAt: string | null;
	revokedAt: string | null;
}

const isoOrNull = (value: Date | null | undefined) =>
	value ? new Date(value).toISOString() : null;

const view = (t: ApiTokenAttributes): TokenView => ({
	id: t.id,
	name: t.name,
	prefix: t.prefix,
	createdAt: new Date(t.createdAt ?? 0).toISOString(),
	lastUsedAt: isoOrNull(t.lastUsedAt),
	revokedAt: isoOrNull(t.revokedAt)
});

/** Whether the user may issue tokens: a lead or author of at least one group (issue 3). */
export async function mayIssueTokens(database: Database, userId: string): Promise<boolean> {
	return (await membershipsOf(database, userId)).size > 0;
}

/** Issues a token; the returned `token` is the only time the secret is seen. */
export async function createToken(
	database: Database,
	userId: string,
	name: string
): Promise<TokenView & { token: string }> {
	if (!(await mayIssueTokens(database, userId)))
		throw new ForbiddenError('Only members of a group issue API tokens.');
	const { name: cleanName } = tokenNameSchema.parse({ name });
	const { token, hash } = newSecret(TOKEN_PREFIX);
	const id = newId();
	await writeTransaction(database, async (transaction) => {
		await database.models.ApiToken.create(
			{ id, userId, name: cleanName, prefix: token.slice(0, 12), tokenHash: hash },
			{ transaction }
		);
		await audit(
			database,
			{
				actorId: userId,
				action: 'token.created',
				subjectType: 'api_token',
				subjectId: id,
				details: { name: cleanName }
			},
			transaction
		);
	});
	const row = (await database.models.ApiToken.findByPk(id))!.get({ plain: true });
	return { ...view(row), token };
}

/** The user's tokens, newest first, revoked ones included. */
export async function listTokens(database: Database, userId: string): Promise<TokenView[]> {
	const rows = await database.models.ApiToken.findAll({
		where: { userId },
		order: [['createdAt', 'DESC']]
	});
	return rows.map((r) => view(r.get({ plain: true })));
}

/** Revokes one of the user's own tokens (again: no-op); NotFoundError for anyone else's. */
export async function revokeToken(
	database: Database,
	userId: string,
	tokenId: string
): Promise<void> {
	const row = await database.models.ApiToken.findOne({ where: { id: tokenId, userId } });
	if (!row) throw new NotFoundError('No such token.');
	if (row.get('revokedAt')) return;
	await writeTransaction(database, async (transaction) => {
		await row.update({ revokedAt: new Date() }, { transaction });
		await audit(
			database,
			{ actorId: userId, action: 'token.revoked', subjectType: 'api_token', subjectId: tokenId },
			transaction
		);
	});
}

/** The user a bearer token acts for, or null for an unknown or revoked token. */
export async function authenticate(database: Database, token: string): Promise<SessionUser | null> {
	if (!token.startsWith(TOKEN_PREFIX)) return null;
	const { ApiToken, User } = database.models;
	const row = await ApiToken.findOne({
		where: { tokenHash: hashSecret(token), revokedAt: { [Op.is]: null } }
	});
	if (!row) return null;
	const record = row.get({ plain: true });
	const user = (await User.findByPk(record.userId))?.get({ plain: true });
	if (!user) return null;
	const now = Date.now();
	if (!record.lastUsedAt || now - new Date(record.lastUsedAt).getTime() > LAST_USED_RESOLUTION_MS) {
		await row.update({ lastUsedAt: new Date(now) });
	}
	return {
		id: user.id,
		email: user.email,
		name: user.name,
		accountRole: user.accountRole,
		emailVerified: user.emailVerifiedAt !== null
	};
}
