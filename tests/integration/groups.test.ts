import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asUser } from './actors';
import { setAccountRole, listUsers } from '../../src/lib/server/accounts/account-roles';
import { signUp, verifyEmail } from '../../src/lib/server/accounts/accounts';
import { ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import { FieldError } from '../../src/lib/server/core/field-error';
import {
	changeMemberRole,
	createGroup,
	getGroup,
	groupsOf,
	removeMember
} from '../../src/lib/server/accounts/groups';
import { hashSecret } from '../../src/lib/server/core/ids';
import { acceptInvitation, findInvitation } from '../../src/lib/server/accounts/invitation-links';
import {
	inviteMember,
	listInvitations,
	revokeInvitation
} from '../../src/lib/server/accounts/invitations';
import { linkToken, mailTo, mailWorld, type MailWorld } from './mail-world';

const PASSWORD = 'lantern-fjord-quartz';

describe('groups, invitations and roles', () => {
	let world: MailWorld;
	let leadId: string;
	let groupId: string;
	beforeAll(async () => {
		world = await mailWorld();
		leadId = await verifiedUser('maren@fjordlight.test', 'Maren Oksvik');
		({ id: groupId } = await createGroup(world.database, asUser(leadId), 'Fjordlight Qudit Lab'));
	});
	afterAll(async () => world?.close());

	/** Signs up and confirms through the mailed link, as a person would. */
	async function verifiedUser(email: string, name: string): Promise<string> {
		const { userId } = await signUp(world.database, {
			email,
			name,
			password: PASSWORD
		});
		await verifyEmail(world.database, await linkToken(world, email, '/verify/'));
		return userId;
	}

	async function invite(email: string, role: 'lead' | 'author') {
		await inviteMember(world.database, asUser(leadId), groupId, { email, role });
		return linkToken(world, email.toLowerCase(), '/invite/');
	}

	const auditActions = async (action: string) =>
		world.database.models.AuditEvent.count({ where: { action, groupId } });

	it('makes the creator of a group its lead; unconfirmed users cannot start one', async () => {
		expect(await groupsOf(world.database, asUser(leadId))).toEqual([
			{ id: groupId, name: 'Fjordlight Qudit Lab', role: 'lead' }
		]);
		const { userId } = await signUp(world.database, {
			email: 'new@fjordlight.test',
			name: 'New',
			password: PASSWORD
		});
		await expect(createGroup(world.database, asUser(userId), 'Shadow Lab')).rejects.toBeInstanceOf(
			ForbiddenError
		);
		await expect(createGroup(world.database, asUser(leadId), ' x ')).rejects.toMatchObject({
			field: 'name'
		});
		expect(await auditActions('group.created')).toBe(1);
	});

	it('invites by e-mail; the invitee signs up, accepts once and joins with the role', async () => {
		const before = Date.now();
		const token = await invite('Bo.Strand@Fjordlight.test', 'author');
		const after = Date.now();
		const [mail] = await mailTo(world, 'bo.strand@fjordlight.test');
		expect(mail.subject).toBe('Maren Oksvik invites you to Fjordlight Qudit Lab on Rankseal');
		const stored = await world.database.models.Invitation.findOne({
			where: { email: 'bo.strand@fjordlight.test' }
		});
		expect(stored!.get('tokenHash')).toBe(hashSecret(token));
		// Seven days from the moment of inviting, bracketed by clock readings around the call.
		const expires = new Date(stored!.get('expiresAt') as Date).getTime();
		expect(expires).toBeGreaterThanOrEqual(before + 7 * 86400e3);
		expect(expires).toBeLessThanOrEqual(after + 7 * 86400e3);
		expect(await findInvitation(world.database, token)).toMatchObject({
			groupName: 'Fjordlight Qudit Lab',
			role: 'author',
			state: 'valid'
		});
		expect(
			(await listInvitations(world.database, asUser(leadId), groupId)).map((i) => i.email)
		).toEqual(['bo.strand@fjordlight.test']);

		// The invitee opens an account with the invited address but has not confirmed it yet.
		const { userId: boId } = await signUp(world.database, {
			email: 'bo.strand@fjordlight.test',
			name: 'Bo Strand',
			password: PASSWORD
		});
		expect(await acceptInvitation(world.database, asUser(boId), token)).toEqual({
			groupId,
			role: 'author'
		});
		expect(await groupsOf(world.database, asUser(boId))).toEqual([
			{ id: groupId, name: 'Fjordlight Qudit Lab', role: 'author' }
		]);
		const bo = (await world.database.models.User.findByPk(boId))!.get({ plain: true });
		expect(bo.emailVerifiedAt).not.toBeNull();
		await expect(acceptInvitation(world.database, asUser(boId), token)).rejects.toMatchObject({
			field: 'invitation'
		});
		expect((await findInvitation(world.database, token))!.state).toBe('accepted');
		expect(await listInvitations(world.database, asUser(leadId), groupId)).toEqual([]);
		expect(await auditActions('invitation.sent')).toBeGreaterThanOrEqual(1);
		expect(await auditActions('invitation.accepted')).toBe(1);
		expect(await auditActions('membership.added')).toBe(1);

		const view = await getGroup(world.database, asUser(boId), groupId);
		expect(view.role).toBe('author');
		expect(view.members.map((m) => [m.email, m.role])).toEqual([
			['maren@fjordlight.test', 'lead'],
			['bo.strand@fjordlight.test', 'author']
		]);
	});

	it('only the invited address may accept; expired and withdrawn invitations do not work', async () => {
		const token = await invite('ane@fjordlight.test', 'lead');
		const otherId = await verifiedUser('per@fjordlight.test', 'Per Dahl');
		await expect(acceptInvitation(world.database, asUser(otherId), token)).rejects.toBeInstanceOf(
			ForbiddenError
		);
		expect((await findInvitation(world.database, token))!.state).toBe('valid');
		expect(await groupsOf(world.database, asUser(otherId))).toEqual([]);

		await world.database.models.Invitation.update(
			{ expiresAt: new Date(Date.now() - 1) },
			{ where: { tokenHash: hashSecret(token) } }
		);
		const aneId = await verifiedUser('ane@fjordlight.test', 'Ane Berg');
		await expect(acceptInvitation(world.database, asUser(aneId), token)).rejects.toMatchObject({
			message: expect.stringMatching(/expired/)
		});

		const again = await invite('ane@fjordlight.test', 'lead');
		const [open] = await listInvitations(world.database, asUser(leadId), groupId);
		await revokeInvitation(world.database, asUser(leadId), groupId, open.id);
		expect(await findInvitation(world.database, again)).toBeNull();
		await expect(acceptInvitation(world.database, asUser(aneId), again)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await expect(
			acceptInvitation(world.database, asUser(aneId), 'nonsense')
		).rejects.toBeInstanceOf(NotFoundError);
	});

	it('an author sees the members but lead-only actions are forbidden', async () => {
		const boId = (await world.database.models.User.findOne({
			where: { email: 'bo.strand@fjordlight.test' }
		}))!.get('id') as string;
		const invitation = inviteMember(world.database, asUser(boId), groupId, {
			email: 'x@fjordlight.test',
			role: 'author'
		});
		await expect(invitation).rejects.toBeInstanceOf(ForbiddenError);
		await expect(
			changeMemberRole(world.database, asUser(boId), groupId, boId, 'lead')
		).rejects.toBeInstanceOf(ForbiddenError);
		await expect(
			removeMember(world.database, asUser(boId), groupId, leadId)
		).rejects.toBeInstanceOf(ForbiddenError);
		await expect(listInvitations(world.database, asUser(boId), groupId)).rejects.toBeInstanceOf(
			ForbiddenError
		);
		expect((await getGroup(world.database, asUser(boId), groupId)).members).toHaveLength(2);
		expect(
			await world.database.models.Invitation.count({ where: { email: 'x@fjordlight.test' } })
		).toBe(0);
	});

	it('answers 404 (NotFoundError) to someone outside the group', async () => {
		const outsiderId = await verifiedUser('vera@elsewhere.test', 'Vera Holm');
		await expect(getGroup(world.database, asUser(outsiderId), groupId)).rejects.toBeInstanceOf(
			NotFoundError
		);
		const invitation = inviteMember(world.database, asUser(outsiderId), groupId, {
			email: 'y@fjordlight.test',
			role: 'lead'
		});
		await expect(invitation).rejects.toBeInstanceOf(NotFoundError);
		await expect(
			removeMember(world.database, asUser(outsiderId), groupId, leadId)
		).rejects.toBeInstanceOf(NotFoundError);
	});

	it('never removes or demotes the last lead', async () => {
		await expect(
			removeMember(world.database, asUser(leadId), groupId, leadId)
		).rejects.toMatchObject({
			message: 'The last lead cannot be removed.'
		});
		await expect(
			changeMemberRole(world.database, asUser(leadId), groupId, leadId, 'author')
		).rejects.toBeInstanceOf(FieldError);
		expect((await groupsOf(world.database, asUser(leadId)))[0].role).toBe('lead');

		const boId = (await world.database.models.User.findOne({
			where: { email: 'bo.strand@fjordlight.test' }
		}))!.get('id') as string;
		await changeMemberRole(world.database, asUser(leadId), groupId, boId, 'lead');
		await changeMemberRole(world.database, asUser(leadId), groupId, leadId, 'author');
		await expect(removeMember(world.database, asUser(boId), groupId, boId)).rejects.toBeInstanceOf(
			FieldError
		);
		await removeMember(world.database, asUser(boId), groupId, leadId);
		expect(await groupsOf(world.database, asUser(leadId))).toEqual([]);
		expect(await auditActions('membership.role-changed')).toBe(2);
		expect(await auditActions('membership.removed')).toBe(1);
	});

	it('lets only admins see users and set account roles, never demoting the last admin', async () => {
		const adminId = await verifiedUser('root@rankseal.test', 'Runa Admin');
		const editorId = await verifiedUser('ed@journal.test', 'Edda Editor');
		await expect(
			setAccountRole(world.database, asUser(editorId), editorId, 'admin')
		).rejects.toBeInstanceOf(ForbiddenError);
		await expect(listUsers(world.database, asUser(editorId))).rejects.toBeInstanceOf(
			ForbiddenError
		);
		await world.database.models.User.update({ accountRole: 'admin' }, { where: { id: adminId } });
		await setAccountRole(world.database, asUser(adminId), editorId, 'editor');
		const users = await listUsers(world.database, asUser(adminId));
		expect(users.find((u) => u.id === editorId)!.accountRole).toBe('editor');
		await expect(
			setAccountRole(world.database, asUser(adminId), adminId, 'researcher')
		).rejects.toMatchObject({ field: 'role' });
	});
});
