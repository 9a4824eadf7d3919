/**
 * Research groups and the roles in them: a lead manages members and invitations, an author sees
 * the member list (rules in permissions.ts). Every change re-reads the actor's role inside its
 * transaction.
 */
import { checkedText } from '$lib/text-rules';
import type { Transaction } from 'sequelize';
import { accountIdOf, isAccount, type Actor } from '../core/actor';
import { requireGroup, requireService } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { GroupRole } from '../db/models/Membership';
import { audit } from '../core/audit';
import { ForbiddenError, NotFoundError } from '../core/errors';
import { FieldError } from '../core/field-error';
import { newId } from '../core/ids';

export const GROUP_ROLES: readonly GroupRole[] = ['lead', 'author'];

export interface GroupSummary {
	id: string;
	name: string;
	role: GroupRole;
}

export interface MemberView {
	userId: string;
	name: string;
	email: string;
	role: GroupRole;
	joinedAt: string;
}

export interface GroupView extends GroupSummary {
	members: MemberView[];
}

/** The groups the actor's account belongs to (none for referees and anonymous callers). */
export async function groupsOf(database: Database, actor: Actor): Promise<GroupSummary[]> {
	if (!isAccount(actor)) return [];
	const { Group, Membership } = database.models;
	const memberships = await Membership.findAll({ where: { userId: actor.userId } });
	const roles = new Map(
		memberships.map((m) => [m.get('groupId') as string, m.get('role') as GroupRole])
	);
	const groups = await Group.findAll({
		where: { id: [...roles.keys()] },
		order: [['name', 'ASC']]
	});
	return groups.map((g) => ({
		id: g.get('id') as string,
		name: g.get('name') as string,
		role: roles.get(g.get('id') as string)!
	}));
}

/** Starts a group with its creator as lead; the creator's address must be confirmed. */
export async function createGroup(
	database: Database,
	actor: Actor,
	name: string
): Promise<GroupSummary> {
	const { userId } = await requireService(database, actor, 'create-group');
	const { text: trimmed, problem } = checkedText(name, 'The group name', 'line');
	if (trimmed.length < 2 || trimmed.length > 120)
		throw new FieldError('name', 'Use 2 to 120 characters.');
	if (problem) throw new FieldError('name', problem);
	const { Group, Membership, User } = database.models;
	const user = await User.findByPk(userId);
	if (!user) throw new NotFoundError('No such user.');
	if (!user.get('emailVerifiedAt'))
		throw new ForbiddenError('Confirm your e-mail address before starting a group.');
	const id = newId();
	await writeTransaction(database, async (transaction) => {
		await Group.create({ id, name: trimmed }, { transaction });
		await Membership.create({ id: newId(), groupId: id, userId, role: 'lead' }, { transaction });
		await audit(
			database,
			{
				actorId: userId,
				groupId: id,
				action: 'group.created',
				subjectType: 'group',
				subjectId: id,
				details: { name: trimmed }
			},
			transaction
		);
	});
	return { id, name: trimmed, role: 'lead' };
}

export async function getGroup(
	database: Database,
	actor: Actor,
	groupId: string
): Promise<GroupView> {
	const role = await requireGroup(database, actor, groupId, 'read');
	const { Group, Membership, User } = database.models;
	const group = (await Group.findByPk(groupId))!;
	const memberships = await Membership.findAll({
		where: { groupId },
		order: [['createdAt', 'ASC']]
	});
	const users = await User.findAll({
		where: { id: memberships.map((m) => m.get('userId') as string) }
	});
	const byId = new Map(users.map((u) => [u.get('id') as string, u.get({ plain: true })]));
	const members = memberships.map((row) => {
		const m = row.get({ plain: true });
		const u = byId.get(m.userId)!;
		return {
			userId: m.userId,
			name: u.name,
			email: u.email,
			role: m.role,
			joinedAt: new Date(m.createdAt!).toISOString()
		};
	});
	return { id: groupId, name: group.get('name') as string, role, members };
}

/** Locks in the rule that a group always keeps at least one lead. */
async function ensureAnotherLead(
	database: Database,
	groupId: string,
	transaction: Transaction,
	message: string
) {
	const leads = await database.models.Membership.count({
		where: { groupId, role: 'lead' },
		transaction
	});
	if (leads <= 1) throw new FieldError('role', message);
}

async function targetMembership(
	database: Database,
	groupId: string,
	memberId: string,
	transaction: Transaction
) {
	const row = await database.models.Membership.findOne({
		where: { groupId, userId: memberId },
		transaction
	});
	if (!row) throw new NotFoundError('No such member.');
	return row;
}

export async function changeMemberRole(
	database: Database,
	actor: Actor,
	groupId: string,
	memberId: string,
	role: GroupRole
): Promise<void> {
	if (!GROUP_ROLES.includes(role)) throw new FieldError('role', 'Choose lead or author.');
	await writeTransaction(database, async (transaction) => {
		await requireGroup(database, actor, groupId, 'manage', transaction);
		const actorId = accountIdOf(actor);
		const membership = await targetMembership(database, groupId, memberId, transaction);
		const previous = membership.get('role') as GroupRole;
		if (previous === role) return;
		if (previous === 'lead')
			await ensureAnotherLead(database, groupId, transaction, 'A group keeps at least one lead.');
		await membership.update({ role }, { transaction });
		const details = { from: previous, to: role };
		await audit(
			database,
			{
				actorId,
				groupId,
				action: 'membership.role-changed',
				subjectType: 'user',
				subjectId: memberId,
				details
			},
			transaction
		);
	});
}

export async function removeMember(
	database: Database,
	actor: Actor,
	groupId: string,
	memberId: string
): Promise<void> {
	await writeTransaction(database, async (transaction) => {
		await requireGroup(database, actor, groupId, 'manage', transaction);
		const actorId = accountIdOf(actor);
		const membership = await targetMembership(database, groupId, memberId, transaction);
		const role = membership.get('role') as GroupRole;
		if (role === 'lead')
			await ensureAnotherLead(database, groupId, transaction, 'The last lead cannot be removed.');
		await membership.destroy({ transaction });
		await audit(
			database,
			{
				actorId,
				groupId,
				action: 'membership.removed',
				subjectType: 'user',
				subjectId: memberId,
				details: { role }
			},
			transaction
		);
	});
}
