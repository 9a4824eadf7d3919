/**
 * The outbox against the REAL local mail catcher and real SMTP servers (smtp-server) on loopback
 * ports: mail written with its event, delivered by deliverDue, retried with back-off while the
 * server is down, each notice delivered exactly once; a stalled server holds no request.
 */
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { catcherTransport, createMailer, type Mailer } from '../../src/lib/server/mail/mail';
import { startMailCatcher } from '../../src/lib/server/mail/mail-catcher';
import { deliverDue, MAX_ATTEMPTS, retryDelayMs } from '../../src/lib/server/mail/mail-sender';
import {
	requestPasswordReset,
	resendVerification,
	signUp
} from '../../src/lib/server/accounts/accounts';
import { renderTemplate } from '../../src/lib/server/mail/templates';
import { asUser } from './actors';
import { temporaryDatabase } from './db';

const ORIGIN = 'http://rankseal.test';
const FROM = 'Rankseal test <no-reply@rankseal.invalid>';
let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;

beforeAll(async () => {
	// Links in mail take the app's one origin (config's ORIGIN).
	process.env.ORIGIN = ORIGIN;
	ctx = await temporaryDatabase();
});
afterAll(async () => ctx?.close());

const mailerOn = (port: number): Mailer =>
	createMailer({ transport: catcherTransport(port), from: FROM, origin: ORIGIN });
const outbox = async () =>
	(await ctx.database.models.OutboxMail.findAll({ order: [['createdAt', 'ASC']] })).map((r) =>
		r.get({ plain: true })
	);
const caughtFor = async (address: string) =>
	(await ctx.database.models.MailMessage.findAll()).filter((m) => m.get('to') === address);
const person = (n: number) => ({
	email: `down.${n}@lab.test`,
	name: `Person ${n}`,
	password: 'long enough pass'
});

describe('the outbox while the mail server is down, then back', () => {
	it('delivers every notice exactly once, retrying with growing waits meanwhile', async () => {
		// A closed port: the catcher ran there a moment ago and was stopped.
		const first = await startMailCatcher(ctx.database, 0);
		const port = first.port;
		await first.close();
		const down = mailerOn(port);
		await signUp(ctx.database, person(1));
		await signUp(ctx.database, person(2));
		const { userId: third } = await signUp(ctx.database, person(3));
		await requestPasswordReset(ctx.database, person(1).email);
		await resendVerification(ctx.database, asUser(third));
		expect((await outbox()).map((m) => m.status)).toEqual(Array(5).fill('queued'));

		const t0 = new Date('2030-01-01T00:00:00Z');
		const failedOnce = await deliverDue(ctx.database, down, t0);
		expect(failedOnce).toMatchObject({ sent: [], failed: expect.any(Array) });
		expect(failedOnce.failed).toHaveLength(5);
		for (const m of await outbox()) {
			expect(m).toMatchObject({ status: 'retrying', attempts: 1 });
			expect(m.lastError).toMatch(/ECONNREFUSED/);
			// The first retry 30 s later (exponential back-off from 30 s: common practice).
			expect(new Date(m.nextAttemptAt!).getTime() - t0.getTime()).toBe(30_000);
		}
		// Not due yet: nothing is tried before its next attempt.
		expect(await deliverDue(ctx.database, down, new Date(t0.getTime() + 29_999))).toEqual({
			sent: [],
			failed: []
		});
		const t1 = new Date(t0.getTime() + 30_000);
		expect((await deliverDue(ctx.database, down, t1)).failed).toHaveLength(5);
		for (const m of await outbox()) {
			expect(m.attempts).toBe(2);
			expect(new Date(m.nextAttemptAt!).getTime() - t1.getTime()).toBe(60_000);
		}
		down.close();

		const back = await startMailCatcher(ctx.database, port);
		const up = mailerOn(back.port);
		try {
			const later = new Date(t1.getTime() + 60_000);
			expect((await deliverDue(ctx.database, up, later)).sent).toHaveLength(5);
			expect(await deliverDue(ctx.database, up, new Date(later.getTime() + 86_400_000))).toEqual({
				sent: [],
				failed: []
			});
		} finally {
			up.close();
			await back.close();
		}
		for (const m of await outbox()) expect(m).toMatchObject({ status: 'sent', attempts: 3 });
		const expected = { 1: 2, 2: 1, 3: 2 } as Record<number, number>;
		for (const n of [1, 2, 3]) {
			const caught = await caughtFor(person(n).email);
			expect(caught, person(n).email).toHaveLength(expected[n]);
			// Each caught message carries its outbox row's id as Message-ID, each id once.
			const ids = caught.map((m) => /^Message-ID: <([^@>]+)@/im.exec(m.get('raw') as string)?.[1]);
			expect(new Set(ids).size).toBe(ids.length);
		}
		expect(await ctx.database.models.MailMessage.count()).toBe(5);
	});

	it('bounds the waits and gives up after the last attempt', () => {
		expect([1, 2, 3, 4].map(retryDelayMs)).toEqual([30_000, 60_000, 120_000, 240_000]);
		expect(retryDelayMs(MAX_ATTEMPTS)).toBe(60 * 60_000);
	});
});

describe('a mail server that accepts and stalls', () => {
	let server: SMTPServer;
	let port: number;
	let holding: Promise<void>;
	let release: () => void = () => undefined;
	let accepted = 0;

	beforeAll(async () => {
		let received: () => void;
		holding = new Promise((done) => (received = done));
		let first = true;
		server = new SMTPServer({
			authOptional: true,
			disabledCommands: ['STARTTLS'],
			logger: false,
			onData(stream, _session, callback) {
				stream.resume();
				stream.on('end', () => {
					const accept = () => {
						accepted += 1;
						callback();
					};
					if (!first) return accept();
					// The first message: say nothing until the test releases it.
					first = false;
					release = accept;
					received();
				});
			}
		});
		await new Promise<void>((done) => server.listen(0, '127.0.0.1', done));
		port = (server.server.address() as AddressInfo).port;
	});
	afterAll(() => new Promise<void>((done) => server.close(() => done())));

	it('does not hold a sign-up: the request returns while the server still holds the mail', async () => {
		const mailer = createMailer({ transport: catcherTransport(port), from: FROM, origin: ORIGIN });
		await signUp(ctx.database, person(10));
		const pass = deliverDue(ctx.database, mailer);
		await holding;
		// The sender is inside the SMTP conversation and the server has not answered.
		const result = await signUp(ctx.database, person(11));
		expect(result.userId).toBeTruthy();
		expect(accepted).toBe(0);
		const rows = (await outbox()).filter((m) => m.to.startsWith('down.1'));
		const byAddress = Object.fromEntries(rows.map((m) => [m.to, m.status]));
		expect(byAddress).toMatchObject({
			'down.10@lab.test': 'sending',
			'down.11@lab.test': 'queued'
		});
		release();
		expect((await pass).sent).toHaveLength(1);
		expect((await deliverDue(ctx.database, mailer)).sent).toHaveLength(1);
		expect(accepted).toBe(2);
		mailer.close();
	});
});

describe('bodies', () => {
	const hostile = '<img src=x onerror=alert(1)> Lamb & "Co" evil.example/reset';

	it('escapes a chosen name in the HTML body and keeps it from becoming a link in either body', async () => {
		const mailer = mailerOn(9);
		await signUp(ctx.database, { ...person(20), name: hostile });
		const [row] = (await outbox()).filter((m) => m.to === person(20).email);
		// HTML escaping of &, <, >, " (OWASP XSS prevention rule 1: common practice).
		expect(row.html).not.toContain('<img');
		expect(row.html).toContain('&lt;img src=x onerror=alert(1)&gt; Lamb &amp; &quot;Co&quot;');
		expect(row.html.match(/<a\b/g)).toHaveLength(1);
		for (const body of [row.text, row.html]) expect(body).not.toContain('evil.example/reset');
		expect(row.text).toContain('evil.\u200bexample/\u200breset');
		mailer.close();
	});

	it('carries no secret but the one link: the token appears once in each body', async () => {
		const mailer = mailerOn(9);
		await signUp(ctx.database, person(21));
		const [row] = (await outbox()).filter((m) => m.to === person(21).email);
		const token = /\/verify\/([A-Za-z0-9_-]+)/.exec(row.text)![1];
		expect(row.text.split(token)).toHaveLength(2);
		expect(row.html.split(token)).toHaveLength(2);
		expect(row.html).toContain(`<a href="${ORIGIN}/verify/${token}"`);
		mailer.close();
	});

	it('turns an inviter named like an address into plain text in the subject and bodies', () => {
		const values = {
			inviter: 'http://evil.example',
			group: 'www.lab.example',
			email: 'new@lab.test',
			role: 'author',
			link: 'http://rankseal.test/invite/tok'
		};
		const mail = renderTemplate('invitation', values);
		for (const part of [mail.subject, mail.text, mail.html]) {
			expect(part).not.toContain('http://evil.example');
			expect(part).not.toContain('www.lab.example');
		}
		expect(mail.html).toContain('href="http://rankseal.test/invite/tok"');
	});
});
