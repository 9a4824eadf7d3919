/**
 * The seam between the app and whatever runs checks and the other engine tasks. The embedded
 * default (runner.ts) is this process's one pool of worker threads (work-pool.ts); docs/scaling.md says how a distributed job
 * queue would take its place. The database row stays the truth: a queue only moves work.
 */
import type { EvidenceFiles } from '../../evidence/layout';
import type { VerificationReport } from '../../evidence/verify';
import type { BundleTask } from './evidence-tasks';
import type { TrialsEvidenceParts, TrialsEvidenceTask } from './trials-evidence-task';
import type { SummaryOutcome, SummaryTask } from './summary';

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
	/** Reads an uploaded counts file against its claim, off the request thread (bucket: who asks). */
	summarise(task: SummaryTask, bucket?: string): Promise<SummaryOutcome>;
	/** Checks a bundle a stranger uploaded (/seal): inflated and re-run off the request thread. */
	verifyBundle(task: BundleTask, bucket: string): Promise<VerificationReport>;
	/** The canonical text of a certificate's counts (parsing them), off the request thread. */
	canonicalCounts(task: { bytes: Uint8Array; dimension: number }, bucket: string): Promise<string>;
	/** A time-ordered certificate's result at its stated level and its summed counts (issue 20). */
	trialsEvidence(task: TrialsEvidenceTask, bucket: string): Promise<TrialsEvidenceParts>;
	/** Checks a certificate's evidence before it is issued, off the request thread. */
	selfCheck(files: EvidenceFiles, bucket: string): Promise<VerificationReport>;
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
