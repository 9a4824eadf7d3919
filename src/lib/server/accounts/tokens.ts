/**
 * API tokens for scripts: `rks_` + 32 random bytes, shown once and stored as SHA-256. A token
 * acts as its owner on claims (TokenScope); it expires (default 90 days) and is revoked by its
 * owner, by a password reset and by signing out everywhere. Who may do what: permissions.ts.
 */
import { textRule } from '$lib/text-rules';
import { Op, type Transaction } from 'sequelize';
import { z } from 'zod';
import { numberFrom, type ValueSource } from '$lib/schema-numbers';
import type { Actor, TokenActor } from '../core/actor';
import { decideToken, requireService } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ApiTokenAttributes } from '../db/models/ApiToken';
import { audit } from '../core/audit';
import { NotFoundError } from '../core/errors';
import { hashSecret, newId, newSecret } from '../core/ids';

export const TOKEN_PREFIX = 'rks_';
export const TOKEN_DEFAULT_DAYS = 90;
export const TOKEN_MAX_DAYS = 365;
const DAY_MS = 24 * 60 * 60 * 1000;
/** lastUsedAt is refreshed at most this often, so that busy scripts do not write on every call. */
const LAST_USED_RESOLUTION_MS = 60_000;

const tokenInput = (source: ValueSource) =>
	z.object({
		name: z
			.string({ error: 'Name the token.' })
			.trim()
			.min(1, 'Name the token.')
			.max(80, 'Keep the name under 80 characters.')
			.superRefine(textRule('The token name', 'line')),
		/** Whole days until it is refused, or 'never'. */
		expiresInDays: z
			.union([
				z.literal('never'),
				numberFrom('The days until it expires', source)
					.int('Give whole days.')
					.min(1, 'At least 1 day.')
					.max(TOKEN_MAX_DAYS, `At most ${TOKEN_MAX_DAYS} days, or “never”.`)
			])
			.default(TOKEN_DEFAULT_DAYS)
	});

export const tokenInputSchema = tokenInput('form');
/** The API's body: the days as a JSON number (or "never"), never as text. */
export const tokenJsonSchema = tokenInput('json');

/** A name, and the days until it expires (a number or its text, or 'never'; default 90). */
export interface TokenInput {
	name: string;
	expiresInDays?: number | string;
}

export interface TokenView {
	id: string;
	name: string;
	prefix: string;
	createdAt: string;
	lastUsedAt: string | null;
	revokedAt: string | null;
	expiresAt: string | null;
}

const isoOrNull = (value: Date | null | undefined) =>
	value ? new Date(value).toISOString() : null;

const view = (t: ApiTokenAttributes): TokenView => ({
	id: t.id,
	name: t.name,
	prefix: t.prefix,
	createdAt: new Date(t.createdAt ?? 0).toISOString(),
	lastUsedAt: isoOrNull(t.lastUsedAt),
	revokedAt: isoOrNull(t.revokedAt),
	expiresAt: isoOrNull(t.expiresAt)
});

/** Whether the actor may issue tokens: a signed-in editor, or a lead or author of a group. */
export async function mayIssueTokens(database: Database, actor: Actor): Promise<boolean> {
	return requireService(database, actor, 'issue-token').then(
		() => true,
		() => false
	);
}

/** Issues a token; the returned `token` is the only time the secret is seen. */
export async function createToken(
	database: Database,
	actor: Actor,
	input: TokenInput
): Promise<TokenView & { token: string }> {
	const { userId } = await requireService(database, actor, 'issue-token');
	const { name, expiresInDays } = tokenInputSchema.parse(input);
	const expiresAt =
		expiresInDays === 'never' ? null : new Date(Date.now() + expiresInDays * DAY_MS);
	const { token, hash } = newSecret(TOKEN_PREFIX);
	const id = newId();
	await writeTransaction(database, async (transaction) => {
		await database.models.ApiToken.create(
			{ id, userId, name, prefix: token.slice(0, 12), tokenHash: hash, expiresAt },
			{ transaction }
		);
		await audit(
			database,
			{
				actorId: userId,
				action: 'token.created',
				subjectType: 'api_token',
				subjectId: id,
				details: { name, expiresAt: expiresAt?.toISOString() ?? null }
			},
			transaction
		);
	});
	const row = (await database.models.ApiToken.findByPk(id))!.get({ plain: true });
	return { ...view(row), token };
}

/** The actor's own tokens, newest first, revoked and expired ones included. */
export async function listTokens(database: Database, actor: Actor): Promise<TokenView[]> {
	const { userId } = await requireService(database, actor, 'manage-tokens');
	const rows = await database.models.ApiToken.findAll({
		where: { userId },
		order: [['createdAt', 'DESC']]
	});
	return rows.map((r) => view(r.get({ plain: true })));
}

/** Revokes one of the actor's own tokens (again: no-op); NotFoundError for anyone else's. */
export async function revokeToken(
	database: Database,
	actor: Actor,
	tokenId: string
): Promise<void> {
	const { userId } = await requireService(database, actor, 'manage-tokens');
	const row = await database.models.ApiToken.findByPk(tokenId);
	if (!row || decideToken(actor, row.get({ plain: true })) !== 'allowed')
		throw new NotFoundError('No such token.');
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

/**
 * Revokes every live token of the account: after a password reset or "sign out everywhere",
 * which the account's own mail describes as ending every way in.
 */
export async function revokeAllTokens(
	database: Database,
	userId: string,
	reason: 'password-reset' | 'signed-out-everywhere',
	transaction?: Transaction
): Promise<number> {
	const [revoked] = await database.models.ApiToken.update(
		{ revokedAt: new Date() },
		{ where: { userId, revokedAt: { [Op.is]: null } }, transaction }
	);
	if (revoked > 0) {
		const entry = { actorId: userId, action: 'token.revoked-all', subjectType: 'user' };
		await audit(
			database,
			{ ...entry, subjectId: userId, details: { reason, revoked } },
			transaction
		);
	}
	return revoked;
}

/** The caller a bearer token stands for, or null for an unknown, revoked or expired token. */
export async function authenticate(database: Database, token: string): Promise<TokenActor | null> {
	if (!token.startsWith(TOKEN_PREFIX)) return null;
	const { ApiToken, User } = database.models;
	const now = new Date();
	const row = await ApiToken.findOne({
		where: {
			tokenHash: hashSecret(token),
			revokedAt: { [Op.is]: null },
			[Op.or]: [{ expiresAt: { [Op.is]: null } }, { expiresAt: { [Op.gt]: now } }]
		}
	});
	if (!row) return null;
	const record = row.get({ plain: true });
	const user = (await User.findByPk(record.userId))?.get({ plain: true });
	if (!user) return null;
	const lastUsed = record.lastUsedAt ? new Date(record.lastUsedAt).getTime() : 0;
	if (now.getTime() - lastUsed > LAST_USED_RESOLUTION_MS) await row.update({ lastUsedAt: now });
	return {
		kind: 'token',
		userId: user.id,
		accountRole: user.accountRole,
		emailVerified: user.emailVerifiedAt !== null,
		tokenId: record.id,
		scope: 'claims'
	};
}
