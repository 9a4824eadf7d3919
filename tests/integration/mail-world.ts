/**
 * A temporary database with the REAL local mail catcher on a free port and a nodemailer SMTP
 * transport to it, plus a lucia instance: what the account and group services need in tests.
 */
import { createLucia } from '../../src/lib/server/accounts/auth';
import type { MailMessageAttributes } from '../../src/lib/server/db/models/MailMessage';
import { catcherTransport, createMailer } from '../../src/lib/server/mail/mail';
import { startMailCatcher } from '../../src/lib/server/mail/mail-catcher';
import { deliverDue } from '../../src/lib/server/mail/mail-sender';
import { temporaryDatabase } from './db';

export const TEST_ORIGIN = 'http://rankseal.test';

export async function mailWorld() {
	// Links in mail take the app's one origin (config's ORIGIN), as in the running app.
	process.env.ORIGIN = TEST_ORIGIN;
	const temporary = await temporaryDatabase();
	const catcher = await startMailCatcher(temporary.database, 0);
	const mailer = createMailer({
		transport: catcherTransport(catcher.port),
		from: 'Rankseal test <no-reply@rankseal.invalid>',
		origin: TEST_ORIGIN
	});
	const lucia = createLucia(temporary.database, false);
	return {
		...temporary,
		catcher,
		mailer,
		lucia,
		close: async () => {
			mailer.close();
			await catcher.close();
			await temporary.close();
		}
	};
}

export type MailWorld = Awaited<ReturnType<typeof mailWorld>>;

/**
 * Messages the catcher stored for one address, oldest first. The outbox is delivered first, as
 * the app's background sender would (driven here, so no test waits on a timer).
 */
export async function mailTo(world: MailWorld, address: string): Promise<MailMessageAttributes[]> {
	await deliverDue(world.database, world.mailer);
	const rows = await world.database.models.MailMessage.findAll({ order: [['createdAt', 'ASC']] });
	return rows.map((r) => r.get({ plain: true })).filter((m) => m.to.split(', ').includes(address));
}

/** The token of the last link to `${TEST_ORIGIN}${prefix}<token>` in the newest message to the address. */
export async function linkToken(
	world: MailWorld,
	address: string,
	prefix: string
): Promise<string> {
	const messages = await mailTo(world, address);
	const text = messages.at(-1)?.text ?? '';
	const escaped = `${TEST_ORIGIN}${prefix}`.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&');
	const match = [...text.matchAll(new RegExp(`${escaped}([A-Za-z0-9_-]+)`, 'g'))].at(-1);
	if (!match) throw new Error(`no ${prefix} link in the last message to ${address}:\n${text}`);
	return match[1];
}
