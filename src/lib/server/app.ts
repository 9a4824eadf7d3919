/**
 * Process-wide services of the running app: the database, the session manager, the mail
 * transport (and local catcher) and the check runner, started once on first use.
 */
import { dev } from '$app/environment';
import { createLucia, type AppLucia } from './auth';
import { config } from './config';
import { db, type Database } from './db';
import { catcherTransport, createMailer, type Mailer } from './mail';
import { startMailCatcher, type MailCatcher } from './mail-catcher';
import { startMailRunner, type MailRunner } from './mail-runner';
import { startCheckRunner } from './checks/runner';
import { serviceKey } from './evidence/keys';
import { sweepOrphanFiles } from './services/certificate-files';
import { seedDemo } from './demo/seed';

export interface AppServices {
	database: Database;
	lucia: AppLucia;
	mailer: Mailer;
	/** The local SMTP catcher, running only when no SMTP_URL is configured. */
	mailCatcher: MailCatcher | null;
	/** Delivers the outbox in the background. */
	mailRunner: MailRunner;
}

let services: Promise<AppServices> | null = null;

async function startMail(
	database: Database
): Promise<{ mailer: Mailer; mailCatcher: MailCatcher | null; mailRunner: MailRunner }> {
	const { smtpUrl, mailFrom, origin, mailCatcherPort } = config();
	const mailCatcher = smtpUrl ? null : await startMailCatcher(database, mailCatcherPort);
	const transport = mailCatcher ? catcherTransport(mailCatcher.port) : smtpUrl;
	const mailer = createMailer({ transport, from: mailFrom, origin });
	const mailRunner = await startMailRunner(database, mailer);
	// adapter-node emits this once the HTTP server has closed (SIGINT, SIGTERM).
	process.once('sveltekit:shutdown' as 'beforeExit', () => void mailRunner.stop());
	return { mailer, mailCatcher, mailRunner };
}

export function app(): Promise<AppServices> {
	services ??= (async () => {
		const database = await db();
		// The signing key exists from the first start; files of an issue cut short are removed.
		serviceKey();
		await sweepOrphanFiles(database);
		const lucia = createLucia(database, !dev && config().origin.startsWith('https:'));
		const mail = await startMail(database);
		// Checks left queued or running by an earlier process resume now.
		await startCheckRunner(database);
		if (config().demo) console.log(`Demo scenario: ${await seedDemo(database)}`);
		return { database, lucia, ...mail };
	})();
	return services;
}
