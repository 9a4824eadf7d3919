/**
 * Invitations into a group, the lead's side: a lead invites an address with a role; the link
 * (stored as SHA-256) works once within 7 days (see invitation-links.ts for the invitee's side).
 */
import { Op } from 'sequelize';
import { accountIdOf, type Actor } from '../core/actor';
import { requireGroup } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { GroupRole } from '../db/models/Membership';
import { mailLink } from '../mail/mail';
import { takeOrRefuse } from '../core/rate-limits';
import { normaliseEmail } from './accounts';
import { audit } from '../core/audit';
import { NotFoundError } from '../core/errors';
import { FieldError } from '../core/field-error';
import { GROUP_ROLES } from './groups';
import { newId, newSecret } from '../core/ids';
import { queueMail } from '../mail/mail-queue';

export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

export interface InvitationView {
	id: string;
	email: string;
	role: GroupRole;
	invitedByName: string;
	createdAt: string;
	expiresAt: string;
}

export async function inviteMember(
	database: Database,
	actor: Actor,
	groupId: string,
	input: { email: string; role: GroupRole }
): Promise<{ invitationId: string }> {
	// Counted per inviting account before anything else, as every path into here must be.
	const what = 'You have sent many invitations in a short time.';
	await takeOrRefuse('invitations', String(accountIdOf(actor)), what);
	const email = normaliseEmail(input.email);
	if (!GROUP_ROLES.includes(input.role)) throw new FieldError('role', 'Choose lead or author.');
	const { Group, Invitation, Membership, User } = database.models;
	const id = await writeTransaction(database, async (transaction) => {
		await requireGroup(database, actor, groupId, 'manage', transaction);
		const actorId = accountIdOf(actor)!;
		const existing = await User.findOne({ where: { email }, transaction });
		if (
			existing &&
			(await Membership.findOne({
				where: { groupId, userId: existing.get('id') as string },
				transaction
			}))
		) {
			throw new FieldError('email', 'This address already belongs to a member of the group.');
		}
		// A new invitation replaces any open one for the same address.
		await Invitation.destroy({ where: { groupId, email, acceptedAt: null }, transaction });
		const { token, hash } = newSecret();
		const id = newId();
		const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
		await Invitation.create(
			{ id, groupId, email, role: input.role, tokenHash: hash, invitedBy: actorId, expiresAt },
			{ transaction }
		);
		const details = { email, role: input.role };
		await audit(
			database,
			{
				actorId,
				groupId,
				action: 'invitation.sent',
				subjectType: 'invitation',
				subjectId: id,
				details
			},
			transaction
		);
		const group = (await Group.findByPk(groupId, { transaction }))!.get('name') as string;
		const inviter = (await User.findByPk(actorId, { transaction }))!.get('name') as string;
		const link = mailLink(`/invite/${token}`);
		const values = { inviter, group, email, role: input.role, link };
		await queueMail(database, transaction, email, 'invitation', values);
		return id;
	});
	return { invitationId: id };
}

/** Open (not accepted, not expired) invitations of a group; leads only. */
export async function listInvitations(
	database: Database,
	actor: Actor,
	groupId: string
): Promise<InvitationView[]> {
	await requireGroup(database, actor, groupId, 'manage');
	const { Invitation, User } = database.models;
	const rows = await Invitation.findAll({
		where: { groupId, acceptedAt: null, expiresAt: { [Op.gt]: new Date() } },
		order: [['createdAt', 'ASC']]
	});
	const inviters = await User.findAll({
		where: { id: rows.map((r) => r.get('invitedBy') as string) }
	});
	const names = new Map(inviters.map((u) => [u.get('id') as string, u.get('name') as string]));
	return rows.map((row) => {
		const i = row.get({ plain: true });
		const times = {
			createdAt: new Date(i.createdAt!).toISOString(),
			expiresAt: new Date(i.expiresAt).toISOString()
		};
		return {
			id: i.id,
			email: i.email,
			role: i.role,
			invitedByName: names.get(i.invitedBy) ?? '',
			...times
		};
	});
}

export async function revokeInvitation(
	database: Database,
	actor: Actor,
	groupId: string,
	invitationId: string
): Promise<void> {
	await writeTransaction(database, async (transaction) => {
		await requireGroup(database, actor, groupId, 'manage', transaction);
		const actorId = accountIdOf(actor);
		const removed = await database.models.Invitation.destroy({
			where: { id: invitationId, groupId, acceptedAt: null },
			transaction
		});
		if (!removed) throw new NotFoundError('No such invitation.');
		await audit(
			database,
			{
				actorId,
				groupId,
				action: 'invitation.revoked',
				subjectType: 'invitation',
				subjectId: invitationId
			},
			transaction
		);
	});
}
