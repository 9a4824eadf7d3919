/**
 * A fidelity-target check whose λ was fitted on a separate calibration run (witnesses.md §4.3′, §9)
 * and frozen: the run is read again, must differ from the certified counts, and must fit to the
 * frozen λ exactly; then the check runs with it. The service's worker, issuing and every verifier
 * call this one function, so they give the same words and refuse the same runs.
 */
import { InputError, type CountsDataset } from '../counts';
import { parseCounts } from '../parse';
import { certifyTarget, type TargetResult } from './certify-target';
import { certifyDeclaredTarget, type DeclaredTarget } from './declared';
import { fitTarget, requireSeparateRun, type TargetFit } from './fit';

/** The caution a fitted target adds to the result, in place of "declared with the claim". */
export const fitCaution = (fit: TargetFit) =>
	`The target λ (${fit.coefficients.map((x) => x.toFixed(6)).join(', ')}) was fitted on a separate calibration run (SHA-256 ${fit.runSha256}: each λ_m² its share of the matching pairs) and frozen before these counts were certified; the tilted vectors of basis 1 must have been set from this λ; the certified number holds for that target only.`;

/** The run read, refused when it is the certified counts, and fitted (λ with Σλ² = 1). */
export function fitSeparateRun(
	run: { bytes: Uint8Array; sha256: string },
	certified: CountsDataset,
	certifiedSha256: string
): TargetFit {
	const dataset = parseCounts(run.bytes, certified.dimension);
	requireSeparateRun(dataset, run.sha256, certified, certifiedSha256);
	return fitTarget(dataset, run.sha256);
}

export interface FittedTargetOptions {
	confidence?: number;
	claim?: number;
	inputSha256: string;
}

/** The check with λ re-fitted from the run; refused when the run no longer fits the frozen λ. */
export function certifyFittedTarget(
	dataset: CountsDataset,
	run: { bytes: Uint8Array; sha256: string },
	frozen: number[],
	options: FittedTargetOptions
): TargetResult & { targetFit: TargetFit } {
	const fit = fitSeparateRun(run, dataset, options.inputSha256);
	if (fit.coefficients.length !== frozen.length || fit.coefficients.some((x, i) => x !== frozen[i]))
		throw new InputError(
			`calibration run: it fits λ = (${fit.coefficients.join(', ')}), not the frozen λ = (${frozen.join(', ')})`
		);
	const result = certifyTarget(dataset, { ...options, target: fit.coefficients });
	return { ...result, targetFit: fit, warnings: [fitCaution(fit), ...result.warnings] };
}

/** A claim's target: declared, or frozen from a calibration run (then the run comes along). */
export type ClaimTarget = DeclaredTarget & { run?: { bytes: Uint8Array; sha256: string } | null };

/** The check for either kind of target: the one entry of the worker, issuing and the verifier. */
export function certifyClaimTarget(
	dataset: CountsDataset,
	target: ClaimTarget,
	options: FittedTargetOptions
): TargetResult {
	const { run, ...declared } = target;
	if (run) return certifyFittedTarget(dataset, run, declared.coefficients, options);
	return certifyDeclaredTarget(dataset, declared, options);
}
