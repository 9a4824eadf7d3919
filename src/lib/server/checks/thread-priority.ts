/**
 * Lowers the scheduling priority of the calling worker thread (Linux: a thread's id names it to
 * setpriority), so that on a machine with fewer cores than busy threads the request thread still
 * gets the processor first: heavy work then slows heavy work, not a bystander's request. Where
 * the system does not say which thread this is, nothing changes.
 */
import { readlinkSync } from 'node:fs';
import { setPriority } from 'node:os';
import { isMainThread } from 'node:worker_threads';

/** Niceness of the pool's threads (0 is the request thread's; 19 the lowest). */
export const WORKER_NICENESS = 10;

export function lowerThisThread(niceness = WORKER_NICENESS): boolean {
	if (isMainThread) return false;
	try {
		// "/proc/thread-self" links to "<pid>/task/<tid>".
		const tid = Number(readlinkSync('/proc/thread-self').split('/').pop());
		if (!Number.isInteger(tid) || tid <= 0) return false;
		setPriority(tid, niceness);
		return true;
	} catch {
		return false;
	}
}
