/**
 * The editor's side of a share notice: opening its link binds the share to their account; an
 * editor without an account makes one from the link (the link came to that mailbox, so the
 * address counts as confirmed).
 */
import { checkedText } from '$lib/text-rules';
import { UniqueConstraintError } from 'sequelize';
import type { Actor } from '../core/actor';
import { hashPassword } from '../accounts/auth';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '../accounts/accounts';
import { audit } from '../core/audit';
import { NotFoundError } from '../core/errors';
import { FieldError } from '../core/field-error';
import { newId } from '../core/ids';
import { findShareByToken } from './shares';

export interface ShareInvite {
	email: string;
	journal: string;
	manuscript: string;
	/** Whether an account with the address exists (sign in rather than sign up). */
	hasAccount: boolean;
}

const GONE = 'This link does not work: the share may have been withdrawn.';

/** What a share notice's link stands for; null for an unknown or withdrawn share. */
export async function findShareInvite(
	database: Database,
	token: string
): Promise<ShareInvite | null> {
	const share = await findShareByToken(database, token);
	if (!share) return null;
	const user = await database.models.User.findOne({ where: { email: share.editorEmail } });
	const { editorEmail: email, journal, manuscript } = share;
	return { email, journal, manuscript, hasAccount: user !== null };
}

/** Binds the share to the signed-in editor with the shared address; the claim's id. */
export async function openShare(database: Database, actor: Actor, token: string): Promise<string> {
	const share = await findShareByToken(database, token);
	if (!share) throw new NotFoundError(GONE);
	if (actor.kind !== 'user') throw new NotFoundError(GONE);
	const user = (await database.models.User.findByPk(actor.userId))!.get({ plain: true });
	if (user.email !== share.editorEmail)
		throw new FieldError(
			'share',
			`This claim was shared with ${share.editorEmail}, but you are signed in as ${user.email}.`
		);
	if (user.accountRole !== 'editor')
		throw new FieldError('share', 'This address belongs to an account that is not an editor’s.');
	if (share.editorId !== user.id || !share.openedAt) {
		await writeTransaction(database, async (transaction) => {
			await database.models.Share.update(
				{ editorId: user.id, openedAt: new Date() },
				{ where: { id: share.id }, transaction }
			);
			const entry = { actorId: user.id, subjectType: 'share', subjectId: share.id };
			await audit(database, { ...entry, action: 'share.opened' }, transaction);
		});
	}
	return share.claimId;
}

/** Makes an editor's account for the shared address and binds the share; the new user's id. */
export async function signUpEditor(
	database: Database,
	token: string,
	input: { name: string; password: string }
): Promise<{ userId: string; claimId: string }> {
	const share = await findShareByToken(database, token);
	if (!share) throw new NotFoundError(GONE);
	const { text: name, problem } = checkedText(input.name, 'Your name', 'line');
	if (!name) throw new FieldError('name', 'Enter your name.');
	if (problem) throw new FieldError('name', problem);
	if (input.password.length < PASSWORD_MIN_LENGTH)
		throw new FieldError('password', `Use at least ${PASSWORD_MIN_LENGTH} characters.`);
	if (input.password.length > PASSWORD_MAX_LENGTH)
		throw new FieldError('password', `Use at most ${PASSWORD_MAX_LENGTH} characters.`);
	const passwordHash = await hashPassword(input.password);
	const userId = newId();
	const email = share.editorEmail;
	try {
		await writeTransaction(database, async (transaction) => {
			const { User, Share } = database.models;
			const account = { id: userId, email, name, passwordHash, accountRole: 'editor' as const };
			await User.create({ ...account, emailVerifiedAt: new Date() }, { transaction });
			await Share.update(
				{ editorId: userId, openedAt: new Date() },
				{ where: { id: share.id }, transaction }
			);
			const entry = { actorId: userId, subjectType: 'user', subjectId: userId };
			await audit(
				database,
				{ ...entry, action: 'account.signed-up', details: { email, via: 'share' } },
				transaction
			);
		});
	} catch (error) {
		if (error instanceof UniqueConstraintError)
			throw new FieldError('email', 'An account with this address exists: sign in instead.');
		throw error;
	}
	return { userId, claimId: share.claimId };
}
