/**
 * Accounts: sign-up with a confirmation link, sign-in, password reset and sign-out. Links are
 * single use and expire (see email-tokens.ts); addresses are kept trimmed and lower-case.
 */
import { UniqueConstraintError, type Transaction } from 'sequelize';
import type { Actor } from '../access/actor';
import { requireService } from '../access/permissions';
import { hashPassword, verifyPassword, type AppLucia } from '../auth';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { invitedAddress } from './invitation-links';
import { mailLink, type Mailer } from '../mail';
import { audit } from './audit';
import {
	RESET_PASSWORD_TTL_MS,
	VERIFY_EMAIL_TTL_MS,
	confirmAddress,
	emailTokenState,
	issueEmailToken,
	useEmailToken,
	type TokenState
} from './email-tokens';
import { FieldError } from './field-error';
import { newId } from './ids';
import { queueMail } from './mail-queue';
import { revokeAllTokens } from './tokens';

import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '$lib/account-limits';

export { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH };

export type LinkResult =
	{ ok: true; userId: string } | { ok: false; reason: Exclude<TokenState, 'valid'> };

export const normaliseEmail = (email: string): string => email.trim().toLowerCase();

function checkPassword(password: string, field = 'password') {
	if (password.length < PASSWORD_MIN_LENGTH) {
		throw new FieldError(field, `Use at least ${PASSWORD_MIN_LENGTH} characters.`);
	}
	if (password.length > PASSWORD_MAX_LENGTH) {
		throw new FieldError(field, `Use at most ${PASSWORD_MAX_LENGTH} characters.`);
	}
}

const EMAIL_TAKEN =
	'An account with this address already exists. Sign in, or ask for a new password.';

/** A new confirmation link, and the mail carrying it, in the caller's transaction. */
async function queueVerification(
	database: Database,
	mailer: Mailer,
	user: { id: string; email: string; name: string },
	transaction: Transaction
) {
	const token = await issueEmailToken(
		database,
		user.id,
		'verify-email',
		VERIFY_EMAIL_TTL_MS,
		transaction
	);
	const values = { name: user.name, email: user.email, link: mailLink(mailer, `/verify/${token}`) };
	await queueMail(database, transaction, user.email, 'verify-email', values);
}

/**
 * Creates an account and mails a confirmation link — unless the sign-up came through a valid
 * invitation to this very address: opening that link already proved the mailbox.
 */
export async function signUp(
	database: Database,
	mailer: Mailer,
	input: { email: string; name: string; password: string },
	proof: { invitationToken?: string | null } = {}
): Promise<{ userId: string }> {
	const { User } = database.models;
	const email = normaliseEmail(input.email);
	const name = input.name.trim();
	if (!name) throw new FieldError('name', 'Enter your name.');
	checkPassword(input.password);
	if (await User.findOne({ where: { email } })) throw new FieldError('email', EMAIL_TAKEN);
	const passwordHash = await hashPassword(input.password);
	const userId = newId();
	try {
		await writeTransaction(database, async (transaction) => {
			const invited = await invitedAddress(database, proof.invitationToken, email, transaction);
			const emailVerifiedAt = invited ? new Date() : null;
			await User.create(
				{ id: userId, email, name, passwordHash, accountRole: 'researcher', emailVerifiedAt },
				{ transaction }
			);
			const entry = {
				actorId: userId,
				action: 'account.signed-up',
				subjectType: 'user',
				subjectId: userId,
				details: { email }
			};
			await audit(database, entry, transaction);
			if (invited) {
				const via = { via: 'invitation' };
				await audit(
					database,
					{ ...entry, action: 'account.email-verified', details: via },
					transaction
				);
				return;
			}
			await queueVerification(database, mailer, { id: userId, email, name }, transaction);
		});
	} catch (error) {
		if (error instanceof UniqueConstraintError) throw new FieldError('email', EMAIL_TAKEN);
		throw error;
	}
	return { userId };
}

/** Sends a fresh confirmation link (the old one stops working); false when already confirmed. */
export async function resendVerification(
	database: Database,
	mailer: Mailer,
	actor: Actor
): Promise<boolean> {
	const { userId } = await requireService(database, actor, 'own-account');
	const user = await database.models.User.findByPk(userId);
	if (!user || user.get('emailVerifiedAt')) return false;
	const { email, name } = user.get({ plain: true });
	await writeTransaction(database, (transaction) =>
		queueVerification(database, mailer, { id: userId, email, name }, transaction)
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

/** Sends a reset link when the address has an account; says nothing either way. */
export async function requestPasswordReset(
	database: Database,
	mailer: Mailer,
	email: string
): Promise<void> {
	const user = await database.models.User.findOne({ where: { email: normaliseEmail(email) } });
	if (!user) return;
	const { id, name, email: address } = user.get({ plain: true });
	await writeTransaction(database, async (transaction) => {
		const ttl = RESET_PASSWORD_TTL_MS;
		const token = await issueEmailToken(database, id, 'reset-password', ttl, transaction);
		const entry = {
			actorId: null,
			action: 'account.password-reset-requested',
			subjectType: 'user',
			subjectId: id
		};
		await audit(database, entry, transaction);
		const link = mailLink(mailer, `/reset/${token}`);
		await queueMail(database, transaction, address, 'reset-password', {
			name,
			email: address,
			link
		});
	});
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
	mailer: Mailer,
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
		const values = { name: user.name, email: user.email, link: mailLink(mailer, '/reset') };
		await queueMail(database, transaction, user.email, 'password-changed', values);
		return used;
	});
	if (!result.ok) return result;
	await lucia.invalidateUserSessions(result.userId);
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
