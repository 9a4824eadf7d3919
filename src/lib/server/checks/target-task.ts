/**
 * `fidelity-target` on the check worker (witnesses.md §4.3′): the declared λ against basis 0 (the
 * computational table) and basis 1 (the tilted-vector table). Relative imports only: bundled.
 */
import { parseCounts } from '../../certify/parse';
import type { TargetResult } from '../../certify/fidelity-target';
import { certifyDeclaredTarget } from '../../certify/fidelity-target/declared';
import type { CheckTask, TargetTaskPart } from './task';

export { TARGET_CAUTION } from '../../certify/fidelity-target/declared';

export const targetPart = (claim: {
	target?: number[] | null;
	targetDeclared?: number[] | null;
}): TargetTaskPart | null =>
	claim.target ? { coefficients: claim.target, declared: claim.targetDeclared ?? null } : null;

/** The exact lower bound on F̃ for the declared target, with its cautions. */
export function runTargetCheck(
	bytes: Uint8Array,
	task: CheckTask & { target: TargetTaskPart },
	inputSha256: string
): TargetResult {
	return certifyDeclaredTarget(parseCounts(bytes, task.dimension), task.target, {
		confidence: task.confidence,
		claim: task.claim,
		inputSha256
	});
}
