/** What callers see of a check (one run of the engine on a dataset) and of a referee's re-run. */
import type { CertificationResult } from '$lib/certify';
import type { CountsAdvice } from '$lib/certify/planner/check-counts';

export const CHECK_STATUSES = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;
export type CheckStatus = (typeof CHECK_STATUSES)[number];

export interface CheckView {
	id: string;
	claimId: string;
	datasetId: string;
	status: CheckStatus;
	/** 0..1 */
	progress: number;
	resamples: number;
	confidence: number;
	seed: number;
	/** Accidentals subtracted before normalising: the result is labelled background-subtracted. */
	subtractAccidentals: boolean;
	createdAt: string;
	startedAt: string | null;
	finishedAt: string | null;
	error: string | null;
	result: CertificationResult | null;
	/** For an unsupported claim more counts would help: the counts needed, simulated after the check. */
	countsAdvice: CountsAdvice | null;
	cancelledAt: string | null;
	/** Who cancelled it: an account's name, or "the referee" for a review link. */
	cancelledBy: string | null;
	/** A referee's re-run from a review link: the referee's, never listed as the authors', never certified. */
	byReferee: boolean;
}

/** How a re-run compares with the certified check. */
export interface Comparison {
	sameSeed: boolean;
	/** Every number equal (the promise for the recorded seed); null until the re-run is done. */
	identical: boolean | null;
	/** |lower bound difference| ≤ the certificate's SE (no SE: `identical`, see seedless.ts); null until done. */
	withinError: boolean | null;
	firstDifference: string | null;
	/**
	 * The certificate's and the re-run's engine versions when they differ (null when the same):
	 * engines change their numbers by design, so the bundle's own verify.mjs is the check then.
	 */
	engines: { certified: string; rerun: string } | null;
}

export type RefereeCheck = CheckView & { comparison: Comparison };
