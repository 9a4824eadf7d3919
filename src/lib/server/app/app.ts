/**
 * Process-wide services of the running app: the database, the session manager, the mail
 * transport (and local catcher) and the check runner, started once on first use.
 */
import { dev } from '$app/environment';
import { createLucia, type AppLucia } from '../accounts/auth';
import { config } from '../core/config';
import { closeDb, db, writeTransaction, type Database } from '../db';
import { catcherTransport, createMailer, type Mailer } from '../mail/mail';
import { startMailCatcher, type MailCatcher } from '../mail/mail-catcher';
import { abortCheckRunner, startCheckRunner } from '../checks/registry';
import { startMailRunner, type MailRunner } from '../mail/mail-runner';
import { serviceKey } from '../evidence/keys';
import { checkLedgerAtStart } from '../ledger/ledger-alarm';
import { introduceKeys } from '../ledger/key-introductions';
import { startUpSweep } from '../storage/sweep';
import { seedDemo } from '../demo/seed';
import { stopOnSignals } from './signals';
import { startDoiRunner, type DoiRunner } from '../certificates/doi-runner';
import { queueMissingDois } from '../certificates/doi-backfill';
import { startOrcid, type OrcidService } from '../accounts/orcid-settings';

export interface AppServices {
	database: Database;
	lucia: AppLucia;
	mailer: Mailer;
	/** The local SMTP catcher, running only when no SMTP_URL is configured. */
	mailCatcher: MailCatcher | null;
	/** Delivers the outbox in the background. */
	mailRunner: MailRunner;
	/** Registers certificate DOIs in the background (and the local fake registry). */
	doiRunner: DoiRunner;
	/** Sign in with ORCID: the real provider (ORCID_ISSUER) or the local fake one. */
	orcid: OrcidService;
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
		// The signing key exists from the first start; files of an upload or issue cut short go.
		serviceKey();
		await startUpSweep(database);
		// A ledger shorter than the last checkpoint published (an older database put back) is logged.
		await checkLedgerAtStart(database);
		// A key rotated while the ledger could not be written is introduced now.
		await writeTransaction(database, (transaction) => introduceKeys(database, transaction));
		const lucia = createLucia(database, !dev && config().origin.startsWith('https:'));
		const mail = await startMail(database);
		// Certificates issued before DOIs existed get theirs; the runner registers them.
		await queueMissingDois(database);
		const doiRunner = await startDoiRunner(database);
		const orcid = await startOrcid(config().origin);
		// Checks left queued or running by an earlier process resume now.
		await startCheckRunner(database);
		if (config().demo) console.log(`Demo scenario: ${await seedDemo(database)}`);
		stopOnSignals(stopApp);
		return { database, lucia, ...mail, doiRunner, orcid };
	})();
	return services;
}

/**
 * Stops what app() started — mail, worker threads, database — so that the process can end.
 * Checks cut short are queued again and resume at the next start (checks/runner.ts abort).
 */
export async function stopApp(): Promise<void> {
	if (!services) return;
	const current = await services;
	services = null;
	await Promise.all([current.mailRunner.stop(2000), current.doiRunner.stop(2000)]);
	current.mailer.close();
	await Promise.all([
		current.mailCatcher?.close(),
		current.orcid.fake?.close(),
		abortCheckRunner(current.database)
	]);
	await closeDb();
}
