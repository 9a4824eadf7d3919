/**
 * Signing up through an invitation (issue 7 §5): the invitation link reached the invitee's
 * mailbox, so it proves the address — no second "confirm your address" mail. Real SQLite file,
 * real SMTP catcher.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signUp } from '../../src/lib/server/accounts/accounts';
import { createGroup } from '../../src/lib/server/accounts/groups';
import {
	acceptInvitation,
	invitationTokenIn
} from '../../src/lib/server/accounts/invitation-links';
import { ForbiddenError } from '../../src/lib/server/core/errors';
import { inviteMember } from '../../src/lib/server/accounts/invitations';
import { problemOf } from '../../src/lib/server/http/problems';
import { asUser } from './actors';
import { addUser } from './backend-fixtures';
import { linkToken, mailTo, mailWorld, type MailWorld } from './mail-world';

const PASSWORD = 'heron-basalt-meadow';
let world: MailWorld;
let leadId: string, groupId: string;

beforeAll(async () => {
	world = await mailWorld();
	leadId = await addUser(world.database, 'Ines Lead');
	({ id: groupId } = await createGroup(world.database, asUser(leadId), 'Basalt Optics'));
});
afterAll(async () => world?.close());

async function invite(email: string): Promise<string> {
	await inviteMember(world.database, asUser(leadId), groupId, {
		email,
		role: 'author'
	});
	return linkToken(world, email, '/invite/');
}

const isVerified = async (userId: string) =>
	(await world.database.models.User.findByPk(userId))!.get('emailVerifiedAt') !== null;

describe('signing up through an invitation', () => {
	it('sends no confirmation mail and counts the address as confirmed', async () => {
		const email = 'tor@basalt.example';
		const token = await invite(email);
		const next = `/invite/${token}`;
		expect(invitationTokenIn(next)).toBe(token);
		const { userId } = await signUp(
			world.database,
			{ email, name: 'Tor Vik', password: PASSWORD },
			{ invitationToken: invitationTokenIn(next) }
		);
		expect((await mailTo(world, email)).map((m) => m.subject)).toEqual([
			'Ines Lead invites you to Basalt Optics on Rankseal'
		]);
		expect(await isVerified(userId)).toBe(true);
		expect(await acceptInvitation(world.database, asUser(userId), token)).toEqual({
			groupId,
			role: 'author'
		});
	});

	it('still mails a confirmation link when the invitation is for another address or unknown', async () => {
		const token = await invite('ulla@basalt.example');
		for (const [email, proof] of [
			['vera@basalt.example', token],
			['wim@basalt.example', 'not-a-token']
		]) {
			const { userId } = await signUp(
				world.database,
				{ email, name: 'Someone', password: PASSWORD },
				{ invitationToken: proof }
			);
			expect(await isVerified(userId)).toBe(false);
			expect((await mailTo(world, email)).length).toBe(1);
		}
	});
});

describe('an invitation opened by someone else', () => {
	it('answers 403 naming the address only masked, writes nothing, and stays usable by the invitee', async () => {
		const email = 'xenia.quell@basalt.example';
		const token = await invite(email);
		const other = await addUser(world.database, 'Yves Other');
		const refused = await acceptInvitation(world.database, asUser(other), token).catch((e) => e);
		expect(refused).toBeInstanceOf(ForbiddenError);
		expect(problemOf(refused)).toMatchObject({ status: 403, code: 'forbidden' });
		expect(refused.message).toBe(
			'This invitation was sent to another address; sign in as x***@b***.example to accept it.'
		);
		const { Membership, Invitation } = world.database.models;
		expect(await Membership.count({ where: { groupId, userId: other } })).toBe(0);
		expect(await Invitation.count({ where: { email, acceptedAt: null } })).toBe(1);
		const { userId } = await signUp(
			world.database,
			{ email, name: 'Xenia Quell', password: PASSWORD },
			{ invitationToken: token }
		);
		await expect(acceptInvitation(world.database, asUser(userId), token)).resolves.toEqual({
			groupId,
			role: 'author'
		});
	});
});
