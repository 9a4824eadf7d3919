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
import { sweepOrphanFiles } from '../storage/certificate-store';
import { checkLedgerAtStart } from '../ledger/ledger-alarm';
import { introduceKeys } from '../ledger/key-introductions';
import { sweepUploadFiles } from '../storage/counts-sweep';
import { seedDemo } from '../demo/seed';

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
		// The signing key exists from the first start; files of an upload or issue cut short go.
		serviceKey();
		await sweepFiles(database);
		// A ledger shorter than the last checkpoint published (an older database put back) is logged.
		await checkLedgerAtStart(database);
		// A key rotated while the ledger could not be written is introduced now.
		await writeTransaction(database, (transaction) => introduceKeys(database, transaction));
		const lucia = createLucia(database, !dev && config().origin.startsWith('https:'));
		const mail = await startMail(database);
		// Checks left queued or running by an earlier process resume now.
		await startCheckRunner(database);
		if (config().demo) console.log(`Demo scenario: ${await seedDemo(database)}`);
		process.once('SIGTERM', beginStop);
		process.once('SIGINT', beginStop);
		// adapter-node emits this once the HTTP server has closed (SIGINT, SIGTERM).
		process.once('sveltekit:shutdown' as 'beforeExit', () => void shutDown());
		return { database, lucia, ...mail };
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
	await current.mailRunner.stop(2000);
	current.mailer.close();
	await Promise.all([current.mailCatcher?.close(), abortCheckRunner(current.database)]);
	await closeDb();
}

/**
 * The whole stop fits in STOP_BOUND_MS: adapter-node lets requests in flight finish for at most
 * SHUTDOWN_TIMEOUT seconds (its default, 30, is too long), then the mail runner gets 2 s and the
 * worker threads and database close. Read by adapter-node after init, so set here.
 */
process.env.SHUTDOWN_TIMEOUT ??= '5';
const STOP_BOUND_MS = 9500;
let stopping = false;

/** True from SIGTERM/SIGINT on: hooks answer new requests 503 while the server drains. */
export const isStopping = (): boolean => stopping;

/** A last resort if some handle still holds the process: exit STOP_BOUND_MS after the signal. */
function beginStop(signal?: string): void {
	if (stopping) return;
	stopping = true;
	// Said after adapter-node's own listener has closed the listening socket (same signal).
	const said = `${signal}: stopping; no new connections, at most ${STOP_BOUND_MS} ms`;
	if (signal) setImmediate(() => console.log(said));
	setTimeout(() => {
		console.error(`shutdown: something still held the process after ${STOP_BOUND_MS} ms`);
		process.exit(1);
	}, STOP_BOUND_MS).unref();
}

async function shutDown(): Promise<void> {
	beginStop();
	try {
		await stopApp();
	} catch (error) {
		console.error('shutdown:', error);
		process.exitCode = 1;
	}
}

/** Start-up sweep: temporary and unowned files go; rows whose files are gone are named loudly. */
async function sweepFiles(database: Database): Promise<void> {
	const certificates = await sweepOrphanFiles(database);
	const uploads = await sweepUploadFiles(database);
	const removed = certificates.length + uploads.removed.length;
	if (removed) console.log(`start-up sweep: removed ${removed} file(s) no row owns`);
	for (const file of uploads.missing) console.error(`start-up sweep: ${file} is missing`);
}
