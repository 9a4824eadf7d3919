/**
 * Invitations, the invitee's side: what a link stands for, and using it. A link works once
 * within 7 days, and only for a signed-in user with the invited address (anyone else: 403).
 */
import { Op, type Transaction } from 'sequelize';
import type { Actor } from '../core/actor';
import { requireInvitee, requireService } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { GroupRole } from '../db/models/Membership';
import { audit } from '../core/audit';
import { confirmAddress } from './email-tokens';
import { NotFoundError } from '../core/errors';
import { FieldError } from '../core/field-error';
import { hashSecret, newId } from '../core/ids';

export interface InvitationInfo {
	groupId: string;
	groupName: string;
	email: string;
	role: GroupRole;
	invitedByName: string;
	state: 'valid' | 'accepted' | 'expired';
}

/** What an invitation link stands for, without using it; null for an unknown or revoked link. */
export async function findInvitation(
	database: Database,
	token: string
): Promise<InvitationInfo | null> {
	const { Group, Invitation, User } = database.models;
	const row = await Invitation.findOne({ where: { tokenHash: hashSecret(token) } });
	if (!row) return null;
	const i = row.get({ plain: true });
	const group = await Group.findByPk(i.groupId);
	const inviter = await User.findByPk(i.invitedBy);
	const state = i.acceptedAt
		? 'accepted'
		: new Date(i.expiresAt).getTime() <= Date.now()
			? 'expired'
			: 'valid';
	const invitedByName = (inviter?.get('name') as string | undefined) ?? '';
	return {
		groupId: i.groupId,
		groupName: (group?.get('name') as string) ?? '',
		email: i.email,
		role: i.role,
		invitedByName,
		state
	};
}

/** The invitation token in a path such as `/invite/<token>` (a sign-up's ?next=), else null. */
export function invitationTokenIn(path: string | null | undefined): string | null {
	return path?.match(/^\/invite\/([A-Za-z0-9_-]+)$/)?.[1] ?? null;
}

/** True when the token is a pending, unexpired invitation to exactly this address. */
export async function invitedAddress(
	database: Database,
	token: string | null | undefined,
	email: string,
	transaction?: Transaction
): Promise<boolean> {
	if (!token) return false;
	const row = await database.models.Invitation.findOne({
		where: {
			tokenHash: hashSecret(token),
			email,
			acceptedAt: null,
			expiresAt: { [Op.gt]: new Date() }
		},
		transaction
	});
	return row !== null;
}

/**
 * Uses the invitation for the signed-in user, whose address must be the invited one; opening
 * the link from that mailbox also confirms the address.
 */
export async function acceptInvitation(
	database: Database,
	actor: Actor,
	token: string
): Promise<{ groupId: string; role: GroupRole }> {
	const { userId } = await requireService(database, actor, 'join-group');
	const { Invitation, Membership, User } = database.models;
	return writeTransaction(database, async (transaction) => {
		const row = await Invitation.findOne({ where: { tokenHash: hashSecret(token) }, transaction });
		if (!row) throw new NotFoundError('This invitation does not exist or was withdrawn.');
		const i = row.get({ plain: true });
		const now = new Date();
		if (i.acceptedAt) throw new FieldError('invitation', 'This invitation has already been used.');
		if (new Date(i.expiresAt) <= now)
			throw new FieldError(
				'invitation',
				'This invitation has expired; ask the group lead for a new one.'
			);
		const user = (await User.findByPk(userId, { transaction }))?.get({ plain: true });
		if (!user) throw new NotFoundError('No such user.');
		requireInvitee(user, i);
		const [used] = await Invitation.update(
			{ acceptedAt: now },
			{ where: { id: i.id, acceptedAt: null }, transaction }
		);
		if (used !== 1) throw new FieldError('invitation', 'This invitation has already been used.');
		const existing = await Membership.findOne({
			where: { groupId: i.groupId, userId },
			transaction
		});
		const role: GroupRole = existing?.get('role') === 'lead' ? 'lead' : i.role;
		if (!existing)
			await Membership.create({ id: newId(), groupId: i.groupId, userId, role }, { transaction });
		else if (existing.get('role') !== role) await existing.update({ role }, { transaction });
		if (await confirmAddress(database, userId, transaction)) {
			await audit(
				database,
				{
					actorId: userId,
					action: 'account.email-verified',
					subjectType: 'user',
					subjectId: userId,
					details: { via: 'invitation' }
				},
				transaction
			);
		}
		const base = { actorId: userId, groupId: i.groupId };
		await audit(
			database,
			{ ...base, action: 'invitation.accepted', subjectType: 'invitation', subjectId: i.id },
			transaction
		);
		await audit(
			database,
			{
				...base,
				action: 'membership.added',
				subjectType: 'user',
				subjectId: userId,
				details: { role }
			},
			transaction
		);
		return { groupId: i.groupId, role };
	});
}
