/**
 * The short engine tasks, on the same pool of worker threads as the checks (work-pool.ts) so that
 * none runs on the request thread: reading an uploaded counts file, checking a stranger's bundle,
 * the canonical counts text, and the self-check of evidence before it is issued.
 */
import type { EvidenceFiles } from '../../evidence/layout';
import type { VerificationReport } from '../../evidence/verify';
import type { BundleTask } from './evidence-tasks';
import type { SummaryOutcome, SummaryTask } from './summary';
import type { TargetRunOutcome, TargetRunTask } from './target-task';
import type { TrialsEvidenceParts, TrialsEvidenceTask } from './trials-evidence-task';
import type { WorkPool } from './work-pool';

export interface EngineTasks {
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
	/** Fits λ on a fidelity-target claim's calibration run, refusing its counts files (§9). */
	fitTargetRun(task: TargetRunTask, bucket: string): Promise<TargetRunOutcome>;
}

export const engineTasksOn = (work: WorkPool): EngineTasks => ({
	summarise(task, bucket = 'upload') {
		const name = task.trials ? 'summariseTrials' : 'summariseCounts';
		return work.runShort(name, task, bucket);
	},
	verifyBundle: (task, bucket) => work.runShort('verifyBundle', task, bucket),
	canonicalCounts: (task, bucket) => work.runShort('canonicalCounts', task, bucket),
	trialsEvidence: (task, bucket) => work.runShort('trialsEvidence', task, bucket),
	selfCheck: (files, bucket) => work.runShort('selfCheck', { files }, bucket),
	fitTargetRun: (task, bucket) => work.runShort('fitTargetRun', task, bucket)
});
