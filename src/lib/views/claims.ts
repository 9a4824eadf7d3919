/** What callers see of a claim, one by one and as a page of the list. */
import type { FourierConvention } from '$lib/certify';
import type { ClaimState } from '$lib/claims/states';
import type { ClaimMethod, TargetSource } from '$lib/claims/target';
import type { CheckStatus } from './checks';

export interface LatestCheck {
	id: string;
	status: CheckStatus;
	certifiedSchmidtNumber: number | null;
	verdict: 'supported' | 'not supported' | null;
}

export interface ClaimView {
	id: string;
	groupId: string;
	groupName: string;
	title: string;
	sourceDescription: string;
	dimension: number;
	method: ClaimMethod;
	bases: number[];
	fourier: FourierConvention;
	claimedSchmidtNumber: number;
	manuscriptReference: string | null;
	state: ClaimState;
	/** Why and when the claim was withdrawn; null while it stands. */
	withdrawal: { reason: string; at: string } | null;
	/** A claim on time-ordered trials (issue 20): its mode and declared probabilities (null: uniform). */
	trials: { mode: 'trials' | 'blocks'; probabilities: number[] | null } | null;
	/** fidelity-target: the declared λ (Σλ² = 1) and, when the service scaled it, λ as declared. */
	target: { coefficients: number[]; declared: number[] | null } | null;
	/** fidelity-target: where λ comes from; null for other methods. */
	targetFrom: TargetSource | null;
	/** The calibration run that froze λ (SHA-256, file name, its matching counts); null until given. */
	targetRun: { sha256: string; name: string; diagonal: number[] } | null;
	/** orcid: the ORCID iD linked to the author's account, or null (sign in with ORCID). */
	createdBy: { id: string; name: string; orcid: string | null };
	createdAt: string;
	updatedAt: string;
	latestCheck: LatestCheck | null;
}

export interface ClaimPage {
	items: ClaimView[];
	total: number;
	page: number;
	pageSize: number;
}
