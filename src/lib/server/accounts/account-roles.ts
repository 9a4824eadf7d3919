/**
 * Account-level roles (researcher, editor, admin), which only admins may see and change
 * (permissions.ts re-reads the actor's role from the database rather than trusting the session).
 */
import type { Actor } from '../core/actor';
import { requireService } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { AccountRole } from '../db/models/User';
import { audit } from '../core/audit';
import { NotFoundError } from '../core/errors';
import { FieldError } from '../core/field-error';

export const ACCOUNT_ROLES: readonly AccountRole[] = ['researcher', 'editor', 'admin'];

export interface UserListItem {
	id: string;
	email: string;
	name: string;
	accountRole: AccountRole;
	emailVerified: boolean;
	createdAt: string;
}

export async function listUsers(database: Database, actor: Actor): Promise<UserListItem[]> {
	await requireService(database, actor, 'manage-accounts');
	const rows = await database.models.User.findAll({ order: [['createdAt', 'ASC']] });
	return rows.map((row) => {
		const u = row.get({ plain: true });
		return {
			id: u.id,
			email: u.email,
			name: u.name,
			accountRole: u.accountRole,
			emailVerified: u.emailVerifiedAt !== null,
			createdAt: new Date(u.createdAt!).toISOString()
		};
	});
}

/** Changes a user's account role; the last admin cannot be demoted, so the service stays run. */
export async function setAccountRole(
	database: Database,
	actor: Actor,
	userId: string,
	role: AccountRole
): Promise<void> {
	if (!ACCOUNT_ROLES.includes(role))
		throw new FieldError('role', 'Choose researcher, editor or admin.');
	const { userId: actorId } = await requireService(database, actor, 'manage-accounts');
	const { User } = database.models;
	await writeTransaction(database, async (transaction) => {
		const user = await User.findByPk(userId, { transaction });
		if (!user) throw new NotFoundError('No such user.');
		const previous = user.get('accountRole') as AccountRole;
		if (previous === role) return;
		if (
			previous === 'admin' &&
			(await User.count({ where: { accountRole: 'admin' }, transaction })) <= 1
		) {
			throw new FieldError('role', 'The last admin cannot be given another role.');
		}
		await user.update({ accountRole: role }, { transaction });
		const details = { from: previous, to: role };
		await audit(
			database,
			{ actorId, action: 'account.role-changed', subjectType: 'user', subjectId: userId, details },
			transaction
		);
	});
}
