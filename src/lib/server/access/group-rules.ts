/** Group rules: members read a group and add claims to it; only a lead, signed in, manages it. */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { GroupRole } from '../db/models/Membership';
import { ForbiddenError, NotFoundError } from '../core/errors';
import type { Actor } from '../core/actor';
import { roleIn, type Decision } from './standing';

export type GroupAction = 'read' | 'create-claim' | 'manage';

export async function decideGroup(
	database: Database,
	actor: Actor,
	groupId: string,
	action: GroupAction,
	transaction?: Transaction
): Promise<{ decision: Decision; role: GroupRole | null }> {
	if (actor.kind === 'anonymous' || actor.kind === 'referee')
		return { decision: 'hidden', role: null };
	const role = await roleIn(database, actor, groupId, transaction);
	if (!role) return { decision: 'hidden', role };
	const mayManage = actor.kind === 'user' && role === 'lead';
	return { decision: action !== 'manage' || mayManage ? 'allowed' : 'denied', role };
}

/** The actor's role in the group when they may do `action`; NotFoundError / ForbiddenError otherwise. */
export async function requireGroup(
	database: Database,
	actor: Actor,
	groupId: string,
	action: GroupAction,
	transaction?: Transaction
): Promise<GroupRole> {
	const { decision, role } = await decideGroup(database, actor, groupId, action, transaction);
	if (decision === 'hidden') throw new NotFoundError('No such group.');
	if (decision === 'denied')
		throw new ForbiddenError(
			actor.kind === 'token'
				? 'An API token cannot manage a group.'
				: 'Only a group lead may do this.'
		);
	return role!;
}
