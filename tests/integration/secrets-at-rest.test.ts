/**
 * No live secret at rest (issue 16 part 5), against a real SQLite file and the real mail catcher:
 * the sessions table holds each session id's SHA-256 (FIPS 180-4), never the cookie's value, so a
 * database read opens no session; a delivered or given-up letter keeps no working reset,
 * confirmation or invitation link in the outbox, while the admin's view in catcher mode still
 * shows the letter as sent; migration 0014 does the same to what was stored before it.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { up as migrate0014 } from '../../src/lib/server/db/migrations/0014-no-live-secrets';
import { catcherTransport, createMailer } from '../../src/lib/server/mail/mail';
import { REMOVED_LINK } from '../../src/lib/server/mail/mail-redact';
import { deliverDue, MAX_ATTEMPTS } from '../../src/lib/server/mail/mail-sender';
import { requestPasswordReset, signUp } from '../../src/lib/server/accounts/accounts';
import { addUser, addGroup } from './backend-fixtures';
import { inviteMember } from '../../src/lib/server/accounts/invitations';
import { getOutboxMessage } from '../../src/lib/server/mail/mail-outbox';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { asUser } from './actors';
import { mailTo, mailWorld, TEST_ORIGIN, type MailWorld } from './mail-world';

let world: MailWorld;
beforeAll(async () => (world = await mailWorld()));
afterAll(async () => world?.close());

/** Every stored body of the outbox, as one text. */
const storedOutbox = async () =>
	(await world.database.models.OutboxMail.findAll())
		.map((m) => `${m.get('text')}\n${m.get('html')}`)
		.join('\n');

describe('sessions', () => {
	it('are stored as the SHA-256 of their id, and the stored value opens nothing', async () => {
		const userId = await addUser(world.database, 'Sigrid Session');
		const session = await world.lucia.createSession(userId, {});
		const rows = await world.database.models.Session.findAll({ where: { userId } });
		expect(rows.map((r) => r.get('id'))).toEqual([sha256Hex(session.id)]);
		expect(sessionKey(session.id)).toBe(sha256Hex(session.id));
		expect((await world.lucia.validateSession(session.id)).user?.id).toBe(userId);
		const stolen = rows[0].get('id') as string;
		expect(await world.lucia.validateSession(stolen)).toEqual({ session: null, user: null });
		await world.lucia.invalidateSession(session.id);
		expect(await world.database.models.Session.count({ where: { userId } })).toBe(0);
	});
});

describe('the outbox once a letter is delivered', () => {
	it('keeps no working reset, confirmation or invitation link, and the admin still reads it', async () => {
		const email = 'rosa.reset@lake.test';
		await signUp(world.database, {
			email,
			name: 'Rosa',
			password: 'long pass phrase 1'
		});
		await requestPasswordReset(world.database, email);
		const lead = await addUser(world.database, 'Lena Lead');
		const groupId = await addGroup(world.database, 'Halvorsen Lake Photonics');
		await world.database.models.Membership.create({
			id: `m-${lead}`,
			groupId,
			userId: lead,
			role: 'lead'
		});
		await inviteMember(world.database, asUser(lead), groupId, {
			email: 'ivo.invited@lake.test',
			role: 'author'
		});
		expect(await storedOutbox()).toMatch(/\/(verify|reset|invite)\/[\w-]{20,}/);
		const caught = await mailTo(world, email); // delivers the outbox to the real catcher
		expect(caught.map((m) => m.text).join('\n')).toContain(`${TEST_ORIGIN}/reset/`);
		const stored = await storedOutbox();
		expect(stored).not.toMatch(/\/(verify|reset|invite)\/[\w-]/);
		expect(stored).toContain(REMOVED_LINK);
		// The catcher is the demo's inbox: the admin's view there reads its copy, link and all.
		const adminId = await addUser(world.database, 'Ada Admin');
		await world.database.models.User.update({ accountRole: 'admin' }, { where: { id: adminId } });
		const admin = asUser(adminId, 'admin');
		const row = await world.database.models.OutboxMail.findOne({
			where: { kind: 'reset-password' }
		});
		const shown = await getOutboxMessage(world.database, admin, row!.get('id') as string);
		expect(shown.status).toBe('sent');
		expect(shown.text).toContain(`${TEST_ORIGIN}/reset/`);
	});

	it('keeps none in a letter given up either', async () => {
		const down = createMailer({
			transport: catcherTransport(1),
			from: 'x <x@x.invalid>',
			origin: TEST_ORIGIN
		});
		await requestPasswordReset(world.database, 'rosa.reset@lake.test');
		const row = await world.database.models.OutboxMail.findOne({
			where: { kind: 'reset-password', status: 'queued' }
		});
		await row!.update({ attempts: MAX_ATTEMPTS - 1 });
		await deliverDue(world.database, down, new Date(Date.now() + 1000));
		down.close();
		await row!.reload();
		expect(row!.get('status')).toBe('failed');
		expect(row!.get('text')).not.toMatch(/\/reset\/[\w-]/);
		expect(row!.get('text')).toContain(REMOVED_LINK);
	});
});

describe('migration 0014 on data stored before it', () => {
	it('drops sessions stored by their cookie value and removes links from sent letters', async () => {
		const { database } = world;
		const userId = await addUser(database, 'Olaf Old');
		await database.models.Session.create({
			id: 'old-cookie-value',
			userId,
			expiresAt: new Date(Date.now() + 1e8)
		});
		const link = `${TEST_ORIGIN}/shared/shr_abcdefghijklmnopqrstuvwxyz`;
		await database.models.OutboxMail.create({
			...{ id: 'old-letter', kind: 'notice-claim-shared', to: 'e@x.test', subject: 'S' },
			...{ text: `Open ${link} now`, html: `<a href="${link}">${link}</a>`, status: 'sent' },
			...{ attempts: 1, nextAttemptAt: null, lastError: null, sentAt: new Date() }
		});
		await migrate0014({ context: database.sequelize.getQueryInterface() });
		expect(await database.models.Session.count()).toBe(0);
		const letter = (await database.models.OutboxMail.findByPk('old-letter'))!.get({ plain: true });
		expect(letter.text).toBe(`Open ${REMOVED_LINK} now`);
		expect(letter.html).toBe(`<a href="#">${REMOVED_LINK}</a>`);
	});
});
