/**
 * The app's background sender: runs deliverDue when mail is queued and on a timer (for retries),
 * never two passes at once; stop() lets the message being sent finish, briefly, then returns.
 */
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
	let stopping = false;
	let again = false;
	let current: Promise<void> | null = null;

	const pass = async () => {
		do {
			again = false;
			await deliverDue(database, mailer, new Date(), () => !stopping).catch((error) =>
				console.error('mail sender:', error)
			);
		} while (again && !stopping);
	};
	const wake = () => {
		if (stopping) return;
		if (current) {
			again = true;
			return;
		}
		current = pass().finally(() => (current = null));
	};
	const timer = setInterval(wake, POLL_MS);
	timer.unref();
	const unsubscribe = onMailQueued(() => setImmediate(wake));
	wake();

	return {
		wake,
		async stop(graceMs = 3000) {
			stopping = true;
			clearInterval(timer);
			unsubscribe();
			if (!current) return;
			// A stalled server must not hold shutdown; an interrupted row is resumed at the next start.
			let timeout: NodeJS.Timeout | undefined;
			const grace = new Promise<void>((done) => (timeout = setTimeout(done, graceMs).unref()));
			await Promise.race([current, grace]);
			clearTimeout(timeout);
		}
	};
}
