/**
 * A fidelity-target check as the service runs it and every verifier re-runs it: the target λ the
 * claim declared (witnesses.md §4.3′), the cautions that say so, and, when the service scaled λ, the
 * values as declared. One function, so that the check, issuing and verify.mjs give the same words.
 */
import type { CountsDataset } from '../counts';
import { certifyTarget, type TargetResult } from './certify-target';

/** Where λ came from, as the claim and the certificate record it. */
export interface DeclaredTarget {
	/** λ with Σλ² = 1, as stored on the claim. */
	coefficients: number[];
	/** λ as declared when the service scaled it; null when it already had Σλ² = 1. */
	declared: number[] | null;
}

export const TARGET_CAUTION =
	'The target λ was declared with the claim, not fitted on these counts; the certified number holds for that declared target only.';

export interface DeclaredTargetOptions {
	confidence?: number;
	claim?: number;
	inputSha256?: string;
}

export function certifyDeclaredTarget(
	dataset: CountsDataset,
	target: DeclaredTarget,
	options: DeclaredTargetOptions
): TargetResult {
	const result = certifyTarget(dataset, { ...options, target: target.coefficients });
	const declared = target.declared;
	const scaled = declared
		? [
				`The declared λ (${declared.join(', ')}) had Σλ² = ${declared.reduce((s, x) => s + x * x, 0)}; Rankseal scaled it to Σλ² = 1.`
			]
		: [];
	return { ...result, warnings: [TARGET_CAUTION, ...scaled, ...result.warnings] };
}
