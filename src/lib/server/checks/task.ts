/** What the check runner hands a worker thread, and what the worker reports back on its port. */
import type { MessagePort } from 'node:worker_threads';
import type { FourierConvention } from '../../certify';
import type { ClaimMethod } from '../../claims/target';
import type { TrialsMode } from '../../certify/trials';
import type { ClaimTarget } from '../../certify/fidelity-target/fitted';

/** What a trials claim adds to a task: its mode and declared probabilities (null: uniform). */
export interface TrialsTaskPart {
	mode: TrialsMode;
	probabilities: number[] | null;
}

/**
 * What a fidelity-target claim adds to a task: λ as stored (Σλ² = 1) and as declared if scaled;
 * and when λ was fitted on a calibration run, the run (re-fitted and compared at check time).
 */
export type TargetTaskPart = ClaimTarget;

export interface CheckTask {
	/** The stored counts file; or `bytes` when the caller holds them already. */
	datasetPath?: string;
	bytes?: Uint8Array;
	/** The SHA-256 the bytes must have: the worker refuses a file that changed on disk. */
	sha256?: string;
	dimension: number;
	method: ClaimMethod;
	bases: number[];
	/** The claim's Fourier convention (which basis basis 1 is). */
	fourier: FourierConvention;
	resamples: number;
	confidence: number;
	seed: number;
	subtractAccidentals?: boolean;
	/** The calibration file stored with the dataset (witnesses.md §4.4), when there is one. */
	calibration?: Uint8Array | null;
	/** The claimed Schmidt number, for the verdict. */
	claim?: number;
	/** Set for a claim on time-ordered trials: the file is trials, the check a supermartingale. */
	trials?: TrialsTaskPart | null;
	/** Set for a fidelity-target claim: the declared λ (witnesses.md §4.3′). */
	target?: TargetTaskPart | null;
	port?: MessagePort;
}

export type CheckMessage = { type: 'started' } | { type: 'progress'; fraction: number };
