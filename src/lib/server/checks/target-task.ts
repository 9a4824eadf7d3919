/**
 * `fidelity-target` on the check worker (witnesses.md §4.3′): the declared λ against basis 0 (the
 * computational table) and basis 1 (the tilted-vector table). Relative imports only: bundled.
 */
import { parseCounts } from '../../certify/parse';
import { certifyTarget, type TargetResult } from '../../certify/fidelity-target';
import type { CheckTask, TargetTaskPart } from './task';

export const targetPart = (claim: {
	target?: number[] | null;
	targetDeclared?: number[] | null;
}): TargetTaskPart | null =>
	claim.target ? { coefficients: claim.target, declared: claim.targetDeclared ?? null } : null;

export const TARGET_CAUTION =
	'The target λ was declared with the claim, not fitted on these counts; the certified number holds for that declared target only.';

/** The exact lower bound on F̃ for the declared target, with its cautions. */
export function runTargetCheck(
	bytes: Uint8Array,
	task: CheckTask & { target: TargetTaskPart },
	inputSha256: string
): TargetResult {
	const dataset = parseCounts(bytes, task.dimension);
	const result = certifyTarget(dataset, {
		target: task.target.coefficients,
		confidence: task.confidence,
		claim: task.claim,
		inputSha256
	});
	const declared = task.target.declared;
	const scaled = declared
		? [
				`The declared λ (${declared.join(', ')}) had Σλ² = ${declared.reduce((s, x) => s + x * x, 0)}; Rankseal scaled it to Σλ² = 1.`
			]
		: [];
	return { ...result, warnings: [TARGET_CAUTION, ...scaled, ...result.warnings] };
}
