/**
 * Accounts: confirming the address, sign-in, setting a new password and sign-out (sign-up and
 * reset requests: account-requests.ts). Links are
 * single use and expire (see email-tokens.ts); addresses are kept trimmed and lower-case.
 */
import type { Actor } from '../core/actor';
import { requireService } from '../access/permissions';
import { hashPassword, verifyPassword, type AppLucia } from './auth';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { mailLink } from '../mail/mail';
import { takeOrRefuse } from '../core/rate-limits';
import { queueVerification } from './account-requests';
import { checkPassword, normaliseEmail } from './account-rules';
import { audit } from '../core/audit';
import { confirmAddress, emailTokenState, useEmailToken, type TokenState } from './email-tokens';
import { newId } from '../core/ids';
import { queueMail } from '../mail/mail-queue';
import { clearSignInPauses } from './sign-in-pauses';
import { revokeAllTokens } from './tokens';

export { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH, normaliseEmail } from './account-rules';
export { requestPasswordReset, signUp, type SignUpOutcome } from './account-requests';

export type LinkResult =
	{ ok: true; userId: string } | { ok: false; reason: Exclude<TokenState, 'valid'> };

const RESEND_WORDS = 'You have asked for several links in a short time.';

/** Sends a fresh confirmation link (the old one stops working); false when already confirmed. Rate-limited per account. */
export async function resendVerification(database: Database, actor: Actor): Promise<boolean> {
	const { userId } = await requireService(database, actor, 'own-account');
	await takeOrRefuse('resendVerification', userId, RESEND_WORDS);
	const user = await database.models.User.findByPk(userId);
	if (!user || user.get('emailVerifiedAt')) return false;
	const { email, name } = user.get({ plain: true });
	await writeTransaction(database, (transaction) =>
		queueVerification(database, { id: userId, email, name }, transaction)
	);
	return true;
}

export const verificationLinkState = (database: Database, token: string) =>
	emailTokenState(database, token, 'verify-email');

export async function verifyEmail(database: Database, token: string): Promise<LinkResult> {
	return writeTransaction(database, async (transaction) => {
		const used = await useEmailToken(database, token, 'verify-email', transaction);
		if (!used.ok) return used;
		await confirmAddress(database, used.userId, transaction);
		const entry = {
			actorId: used.userId,
			action: 'account.email-verified',
			subjectType: 'user',
			subjectId: used.userId
		};
		await audit(database, entry, transaction);
		return used;
	});
}

let dummyHash: Promise<string> | null = null;

/** The user id when the address and password match; null otherwise, in about the same time. */
export async function signIn(
	database: Database,
	email: string,
	password: string
): Promise<{ userId: string } | null> {
	const user = await database.models.User.findOne({ where: { email: normaliseEmail(email) } });
	if (!user) {
		// Hash against a throwaway value so an unknown address costs what a wrong password costs.
		dummyHash ??= hashPassword(`no-such-user-${newId()}`);
		await verifyPassword(await dummyHash, password);
		return null;
	}
	const ok = await verifyPassword(user.get('passwordHash') as string, password);
	return ok ? { userId: user.get('id') as string } : null;
}

export const resetLinkState = (database: Database, token: string) =>
	emailTokenState(database, token, 'reset-password');

/**
 * Sets the new password and ends every way into the account (sessions and API tokens); the link
 * also confirms the address.
 */
export async function resetPassword(
	database: Database,
	lucia: AppLucia,
	token: string,
	newPassword: string
): Promise<LinkResult> {
	checkPassword(newPassword);
	const passwordHash = await hashPassword(newPassword);
	const result = await writeTransaction(database, async (transaction): Promise<LinkResult> => {
		const used = await useEmailToken(database, token, 'reset-password', transaction);
		if (!used.ok) return used;
		const { User } = database.models;
		await User.update({ passwordHash }, { where: { id: used.userId }, transaction });
		await confirmAddress(database, used.userId, transaction);
		await revokeAllTokens(database, used.userId, 'password-reset', transaction);
		const entry = {
			actorId: used.userId,
			action: 'account.password-reset',
			subjectType: 'user',
			subjectId: used.userId
		};
		await audit(database, entry, transaction);
		const user = (await User.findByPk(used.userId, { transaction }))!.get({ plain: true });
		const values = { name: user.name, email: user.email, link: mailLink('/reset') };
		await queueMail(database, transaction, user.email, 'password-changed', values);
		return used;
	});
	if (!result.ok) return result;
	await lucia.invalidateUserSessions(result.userId);
	const { User } = database.models;
	const user = await User.findByPk(result.userId, { attributes: ['email'] });
	const email = user!.get('email') as string;
	await clearSignInPauses(normaliseEmail(email));
	return result;
}

export const signOut = (lucia: AppLucia, sessionId: string) => lucia.invalidateSession(sessionId);

/** Ends every session of the signed-in user and revokes their API tokens. */
export async function signOutEverywhere(
	database: Database,
	lucia: AppLucia,
	actor: Actor
): Promise<void> {
	const { userId } = await requireService(database, actor, 'own-account');
	await revokeAllTokens(database, userId, 'signed-out-everywhere');
	await lucia.invalidateUserSessions(userId);
}
