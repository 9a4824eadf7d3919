/**
 * Accounts: sign-up with a confirmation link, sign-in, password reset and sign-out. Links are
 * single use and expire (see email-tokens.ts); addresses are kept trimmed and lower-case.
 */
import { UniqueConstraintError } from 'sequelize';
import type { Actor } from '../access/actor';
import { requireService } from '../access/permissions';
import { hashPassword, verifyPassword, type AppLucia } from '../auth';
import type { Database } from '../db';
import { mailLink, sendTemplate, type Mailer } from '../mail';
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

async function sendVerification(
	mailer: Mailer,
	user: { email: string; name: string },
	token: string
) {
	const link = mailLink(mailer, `/verify/${token}`);
	await sendTemplate(mailer, user.email, 'verify-email', { ...user, link });
}

export async function signUp(
	database: Database,
	mailer: Mailer,
	input: { email: string; name: string; password: string }
): Promise<{ userId: string }> {
	const { User } = database.models;
	const email = normaliseEmail(input.email);
	const name = input.name.trim();
	if (!name) throw new FieldError('name', 'Enter your name.');
	checkPassword(input.password);
	if (await User.findOne({ where: { email } })) throw new FieldError('email', EMAIL_TAKEN);
	const passwordHash = await hashPassword(input.password);
	const userId = newId();
	let token: string;
	try {
		token = await database.sequelize.transaction(async (transaction) => {
			await User.create(
				{ id: userId, email, name, passwordHash, accountRole: 'researcher' },
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
			return issueEmailToken(database, userId, 'verify-email', VERIFY_EMAIL_TTL_MS, transaction);
		});
	} catch (error) {
		if (error instanceof UniqueConstraintError) throw new FieldError('email', EMAIL_TAKEN);
		throw error;
	}
	await sendVerification(mailer, { email, name }, token);
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
	const token = await issueEmailToken(database, userId, 'verify-email', VERIFY_EMAIL_TTL_MS);
	await sendVerification(mailer, { email, name }, token);
	return true;
}

export const verificationLinkState = (database: Database, token: string) =>
	emailTokenState(database, token, 'verify-email');

export async function verifyEmail(database: Database, token: string): Promise<LinkResult> {
	return database.sequelize.transaction(async (transaction) => {
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
	const token = await issueEmailToken(database, id, 'reset-password', RESET_PASSWORD_TTL_MS);
	await audit(database, {
		actorId: null,
		action: 'account.password-reset-requested',
		subjectType: 'user',
		subjectId: id
	});
	await sendTemplate(mailer, address, 'reset-password', {
		name,
		email: address,
		link: mailLink(mailer, `/reset/${token}`)
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
	const result = await database.sequelize.transaction(async (transaction): Promise<LinkResult> => {
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
		return used;
	});
	if (!result.ok) return result;
	await lucia.invalidateUserSessions(result.userId);
	const user = (await database.models.User.findByPk(result.userId))!.get({ plain: true });
	const link = mailLink(mailer, '/reset');
	await sendTemplate(mailer, user.email, 'password-changed', {
		name: user.name,
		email: user.email,
		link
	});
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
