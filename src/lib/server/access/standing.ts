/**
 * What the permission rules are decided on: the actor's memberships and open shares, read from
 * the database as they are now, and the shape of a decision. Callers import through permissions.ts.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { GroupRole } from '../db/models/Membership';
import type { AccountActor } from '../core/actor';

export type Decision = 'allowed' | 'denied' | 'hidden';

/** The actor's role in the group, from the database as it is now (or in the transaction). */
export async function roleIn(
	database: Database,
	actor: AccountActor,
	groupId: string,
	transaction?: Transaction
): Promise<GroupRole | null> {
	const row = await database.models.Membership.findOne({
		where: { userId: actor.userId, groupId },
		transaction
	});
	return (row?.get('role') as GroupRole | undefined) ?? null;
}

/** Ids of the groups the actor is a member of. */
export async function groupIdsOf(database: Database, actor: AccountActor): Promise<string[]> {
	const rows = await database.models.Membership.findAll({ where: { userId: actor.userId } });
	return rows.map((r) => r.get('groupId') as string);
}

/** Whether the editor holds an open (not withdrawn) share of this claim. */
export async function sharedWith(
	database: Database,
	actor: AccountActor,
	claimId: string,
	transaction?: Transaction
): Promise<boolean> {
	const where = { claimId, editorId: actor.userId, withdrawnAt: null };
	return (await database.models.Share.count({ where, transaction })) > 0;
}

/** Ids of the claims shared with an editor (for lists); the same rule as sharedWith. */
export async function sharedClaimIds(database: Database, actor: AccountActor): Promise<string[]> {
	const rows = await database.models.Share.findAll({
		where: { editorId: actor.userId, withdrawnAt: null },
		attributes: ['claimId']
	});
	return rows.map((r) => r.get('claimId') as string);
}
