/**
 * The seam between the app and whatever runs checks (the short engine tasks are engine-tasks.ts).
 * The embedded default (runner.ts) is this process's one pool of worker threads (work-pool.ts);
 * docs/scaling.md says how a distributed job queue would take its place. The database row stays
 * the truth: a queue only moves work.
 */

/** A check to run and the bucket it queues in (fairness and limits are per bucket). */
export interface QueuedCheck {
	id: string;
	bucket: string;
}

export interface CheckQueue {
	/** Queues the check unless it is queued or running already. */
	enqueue(check: QueuedCheck): void;
	/** Takes a waiting check out or aborts a running one; false when this queue does not hold it. */
	cancel(checkId: string): boolean;
	/**
	 * Re-queues the checks a previous process left queued or running, but fails one cut off while
	 * running MAX_CHECK_STARTS times (checks/left-behind.ts); returns the ids queued again.
	 */
	resume(): Promise<string[]>;
	/** Resolves when nothing is queued or running (tests, demo). */
	idle(): Promise<void>;
	/** Waits for everything queued, then stops. */
	close(): Promise<void>;
	/** Stops now; checks cut short are queued again in the database and resume at the next start. */
	abort(): Promise<void>;
}

/** Review re-runs queue by their link, apart from the group's own checks. */
export const checkBucket = (groupId: string, reviewLinkId?: string | null): string =>
	reviewLinkId ? `review-link:${reviewLinkId}` : `group:${groupId}`;

/** The abort reason of a check cancelled by a person: the runner then writes nothing more. */
export class CheckCancelled extends Error {
	constructor() {
		super('the check was cancelled');
		this.name = 'CheckCancelled';
	}
}
