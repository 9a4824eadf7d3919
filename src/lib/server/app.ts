/**
 * Process-wide services of the running app: the database, the session manager, the mail
 * transport (and local catcher) and the check runner, started once on first use.
 */
import { dev } from '$app/environment';
import { createLucia, type AppLucia } from './auth';
import { config } from './config';
import { closeDb, db, type Database } from './db';
import { catcherTransport, createMailer, type Mailer } from './mail';
import { startMailCatcher, type MailCatcher } from './mail-catcher';
import { abortCheckRunner, startCheckRunner } from './checks/runner';
import { startMailRunner, type MailRunner } from './mail-runner';
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
		if (config().demo) console.log(`Demo scenario: ${await seedDemo(database, mail.mailer)}`);
		// adapter-node emits this once the HTTP server has closed (SIGINT, SIGTERM).
		process.once('sveltekit:shutdown' as 'beforeExit', () => void shutDown());
		return { database, lucia, ...mail };
	})();
	return services;
}

/**
 * Stops what app() started — mail, worker threads, database — so that the process can end.
 * Checks cut short stay queued or running and resume at the next start.
 */
export async function stopApp(): Promise<void> {
	if (!services) return;
	const current = await services;
	services = null;
	await current.mailRunner.stop();
	current.mailer.close();
	await Promise.all([current.mailCatcher?.close(), abortCheckRunner(current.database)]);
	await closeDb();
}

/** A last resort if some handle still holds the process: exit this long after the signal. */
const EXIT_GRACE_MS = 5000;

async function shutDown(): Promise<void> {
	setTimeout(() => {
		console.error(`shutdown: something still held the process after ${EXIT_GRACE_MS} ms`);
		process.exit(1);
	}, EXIT_GRACE_MS).unref();
	try {
		await stopApp();
	} catch (error) {
		console.error('shutdown:', error);
		process.exitCode = 1;
	}
}
