/**
 * One embedded check runner per database: started on first use, stopped (waiting for running
 * checks) or aborted (for shutdown) as a whole.
 */
import { outsideRequest } from '../core/acting';
import { config } from '../core/config';
import type { Database } from '../db';
import { checkWorkerFile } from './locate';
import type { CheckQueue } from './queue';
import { CheckRunner } from './runner';

const runners = new WeakMap<Database, Promise<CheckQueue>>();

/**
 * The runner of this database, started on first use; starting it re-queues the checks a
 * previous process left behind. Call it once at start-up so that those resume promptly.
 */
export function startCheckRunner(database: Database): Promise<CheckQueue> {
	let runner = runners.get(database);
	if (!runner) {
		runner = outsideRequest(async () => {
			const { checkWorkers, shortTaskWorkers } = config();
			const file = await checkWorkerFile();
			const started = new CheckRunner(database, file, checkWorkers, shortTaskWorkers);
			await started.resume();
			return started;
		});
		runners.set(database, runner);
		runner.catch(() => runners.delete(database));
	}
	return runner;
}

export const hasCheckRunner = (database: Database): boolean => runners.has(database);

/** Waits for running checks, then stops the worker threads. */
export async function stopCheckRunner(database: Database): Promise<void> {
	const runner = runners.get(database);
	if (!runner) return;
	runners.delete(database);
	await (await runner).close();
}

/** For shutdown: stops the worker threads without waiting for running checks (they resume later). */
export async function abortCheckRunner(database: Database): Promise<void> {
	const runner = runners.get(database);
	if (!runner) return;
	runners.delete(database);
	await (await runner).abort();
}
