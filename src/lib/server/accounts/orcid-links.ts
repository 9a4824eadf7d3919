/**
 * An account's ORCID iD: found by iD for a sign-in, linked by the signed-in owner (after a
 * password sign-in, never by a matching e-mail address), unlinked from the account page.
 * One account per iD and one iD per account; each change is audited.
 */
import type { Actor } from '../core/actor';
import { requireService } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { audit } from '../core/audit';
import { ConflictError } from '../core/errors';

/** The account that has this iD linked, or null. */
export async function accountWithOrcid(database: Database, orcid: string): Promise<string | null> {
	const user = await database.models.User.findOne({ where: { orcid }, attributes: ['id'] });
	return (user?.get('id') as string | undefined) ?? null;
}

/** The ORCID iD linked to an account (e.g. for DataCite creators), or null. */
export async function orcidForAccount(database: Database, userId: string): Promise<string | null> {
	const user = await database.models.User.findByPk(userId, { attributes: ['orcid'] });
	return (user?.get('orcid') as string | null | undefined) ?? null;
}

/** Links the iD to the actor's own account; refused when another account has it or this one has another. */
export async function linkOrcid(database: Database, actor: Actor, orcid: string): Promise<void> {
	const { userId } = await requireService(database, actor, 'own-account');
	await writeTransaction(database, async (transaction) => {
		const { User } = database.models;
		const holder = await User.findOne({ where: { orcid }, attributes: ['id'], transaction });
		const holderId = holder?.get('id') as string | undefined;
		if (holderId === userId) return;
		if (holderId)
			throw new ConflictError(
				`The ORCID iD ${orcid} is already linked to another Rankseal account. Unlink it there first.`
			);
		const own = await User.findByPk(userId, { attributes: ['orcid'], transaction });
		const current = own?.get('orcid') as string | null;
		if (current)
			throw new ConflictError(
				`This account already has the ORCID iD ${current}. Unlink it on the account page first.`
			);
		await User.update({ orcid }, { where: { id: userId }, transaction });
		const entry = { actorId: userId, action: 'account.orcid-linked', subjectType: 'user' };
		await audit(database, { ...entry, subjectId: userId, details: { orcid } }, transaction);
	});
}

/** Removes the actor's own iD (no-op without one); ORCID sign-in then no longer reaches the account. */
export async function unlinkOrcid(database: Database, actor: Actor): Promise<void> {
	const { userId } = await requireService(database, actor, 'own-account');
	await writeTransaction(database, async (transaction) => {
		const { User } = database.models;
		const own = await User.findByPk(userId, { attributes: ['orcid'], transaction });
		const orcid = own?.get('orcid') as string | null;
		if (!orcid) return;
		await User.update({ orcid: null }, { where: { id: userId }, transaction });
		const entry = { actorId: userId, action: 'account.orcid-unlinked', subjectType: 'user' };
		await audit(database, { ...entry, subjectId: userId, details: { orcid } }, transaction);
	});
}
