import { createServer, type Server } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMailer } from '../../src/lib/server/mail/mail';
import { startMailCatcher } from '../../src/lib/server/mail/mail-catcher';
import { requestPasswordReset } from '../../src/lib/server/accounts/accounts';
import { ConflictError, ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import {
	getOutboxMessage,
	listOutbox,
	requeueOutboxMessage
} from '../../src/lib/server/mail/mail-outbox';
import { fillPlaceholders, renderTemplate } from '../../src/lib/server/mail/templates';
import { newId } from '../../src/lib/server/core/ids';
import { asUser } from './actors';
import { mailTo, mailWorld, type MailWorld } from './mail-world';

describe('mail: nodemailer to the local SMTP catcher', () => {
	let world: MailWorld;
	beforeAll(async () => (world = await mailWorld()));
	afterAll(async () => world?.close());

	it('stores a message sent over SMTP as a MailMessage row, text and headers intact', async () => {
		expect(world.catcher.port).toBeGreaterThan(0);
		await world.mailer.send({
			to: 'reader@lab.test',
			subject: 'Schmidt number ≥ 9 in d = 17',
			text: 'Line one\nhttp://rankseal.test/claims/abc\n'
		});
		const [message] = await mailTo(world, 'reader@lab.test');
		expect(message.subject).toBe('Schmidt number ≥ 9 in d = 17');
		expect(message.from).toContain('no-reply@rankseal.invalid');
		expect(message.text).toContain('http://rankseal.test/claims/abc');
		expect(message.raw).toMatch(/^Subject: /m);
		expect(message.html).toBeNull();
	});

	it('works with an smtp:// URL as well, as SMTP_URL would give it', async () => {
		const byUrl = createMailer({
			transport: `smtp://127.0.0.1:${world.catcher.port}`,
			from: 'Rankseal <x@rankseal.invalid>',
			origin: 'http://rankseal.test'
		});
		try {
			await byUrl.send({ to: 'url@lab.test', subject: 'By URL', text: 'Hello' });
		} finally {
			byUrl.close();
		}
		expect((await mailTo(world, 'url@lab.test')).map((m) => m.subject)).toEqual(['By URL']);
	});

	it('moves to a free port, rather than failing, when its port is taken', async () => {
		const blocker: Server = createServer();
		await new Promise<void>((done) => blocker.listen(0, '127.0.0.1', done));
		const taken = (blocker.address() as { port: number }).port;
		const second = await startMailCatcher(world.database, taken);
		try {
			expect(second.port).not.toBe(taken);
			const mailer = createMailer({
				transport: { host: '127.0.0.1', port: second.port, ignoreTLS: true },
				from: 'a@rankseal.invalid',
				origin: 'http://rankseal.test'
			});
			await mailer.send({ to: 'moved@lab.test', subject: 'Moved', text: 'ok' });
			mailer.close();
			expect(await mailTo(world, 'moved@lab.test')).toHaveLength(1);
		} finally {
			await second.close();
			await new Promise((done) => blocker.close(done));
		}
	});

	it('shows the outbox, each message with its delivery status, to admins only', async () => {
		const { User } = world.database.models;
		const admin = newId();
		const researcher = newId();
		await User.create({
			id: admin,
			email: 'admin@lab.test',
			name: 'Ada Admin',
			passwordHash: 'x',
			accountRole: 'admin'
		});
		await User.create({
			id: researcher,
			email: 'r@lab.test',
			name: 'Rui Research',
			passwordHash: 'x',
			accountRole: 'researcher'
		});
		await requestPasswordReset(world.database, 'r@lab.test');
		const queued = await listOutbox(world.database, asUser(admin));
		expect(queued.items[0]).toMatchObject({ to: 'r@lab.test', status: 'queued', attempts: 0 });
		await mailTo(world, 'r@lab.test');
		const outbox = await listOutbox(world.database, asUser(admin), 1, 'sent');
		expect(outbox.items[0]).toMatchObject({ to: 'r@lab.test', status: 'sent', attempts: 1 });
		const message = await getOutboxMessage(world.database, asUser(admin), outbox.items[0].id);
		expect(message.text).toContain('/reset/');
		const hidden = await getOutboxMessage(world.database, asUser(admin), message.id, {
			revealSecretLinks: false
		});
		expect(hidden.text).not.toContain('/reset/');
		expect(hidden.html).not.toContain('/reset/');
		await expect(listOutbox(world.database, asUser(researcher))).rejects.toBeInstanceOf(
			ForbiddenError
		);
		await expect(
			getOutboxMessage(world.database, asUser(researcher), message.id)
		).rejects.toBeInstanceOf(ForbiddenError);
		await expect(getOutboxMessage(world.database, asUser(admin), 'missing')).rejects.toBeInstanceOf(
			NotFoundError
		);
		await expect(
			requeueOutboxMessage(world.database, asUser(admin), message.id)
		).rejects.toBeInstanceOf(ConflictError);
	});
});

describe('mail templates', () => {
	it('renders the subject line and fills every placeholder', () => {
		const mail = renderTemplate('invitation', {
			inviter: 'Maren Oksvik',
			group: 'Fjordlight Qudit Lab',
			email: 'new@lab.test',
			role: 'author',
			link: 'http://rankseal.test/invite/tok'
		});
		expect(mail.subject).toBe('Maren Oksvik invites you to Fjordlight Qudit Lab on Rankseal');
		expect(mail.text).toContain('http://rankseal.test/invite/tok');
		expect(mail.text).not.toMatch(/\{\{|Subject:/);
	});

	it('refuses to send a placeholder without a value', () => {
		expect(() => fillPlaceholders('Hello {{name}}', {})).toThrow(/name/);
	});
});
