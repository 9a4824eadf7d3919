/**
 * The app's background sender: runs deliverDue when mail is queued and on a timer (for retries),
 * never two passes at once; stop() lets the message being sent finish, briefly, then returns.
 */
import { startBackgroundLoop } from '../core/background-loop';
import type { Database } from '../db';
import type { Mailer } from './mail';
import { deliverDue, resumeInterrupted } from './mail-sender';
import { onMailQueued } from './mail-queue';

export interface MailRunner {
	/** Asks for a pass soon (after the current one, if one is running). */
	wake(): void;
	/** Stops the timer and waits for the current pass, at most `graceMs`. */
	stop(graceMs?: number): Promise<void>;
}

const POLL_MS = 15_000;

export async function startMailRunner(database: Database, mailer: Mailer): Promise<MailRunner> {
	await resumeInterrupted(database);
	const loop = startBackgroundLoop({
		pass: (keepGoing) => deliverDue(database, mailer, new Date(), keepGoing),
		subscribe: onMailQueued,
		pollMs: POLL_MS,
		label: 'mail sender'
	});
	return { wake: loop.wake, stop: (graceMs = 3000) => loop.stop(graceMs) };
}
