/**
 * `fidelity-target` on the check worker (witnesses.md §4.3′): the claim's λ (declared, or fitted on
 * a separate calibration run and frozen) against basis 0 (the computational table) and basis 1
 * (the tilted-vector table); and the pool task that fits λ when the run is uploaded.
 * Relative imports only: bundled.
 */
import { InputError } from '../../certify/counts';
import { parseCounts } from '../../certify/parse';
import type { TargetResult } from '../../certify/fidelity-target';
import { certifyClaimTarget } from '../../certify/fidelity-target/fitted';
import { fitTarget, requireSeparateRun, type TargetFit } from '../../certify/fidelity-target/fit';
import type { CheckTask, TargetTaskPart } from './task';

export { TARGET_CAUTION } from '../../certify/fidelity-target/declared';

export const targetPart = (claim: {
	target?: number[] | null;
	targetDeclared?: number[] | null;
	targetRun?: Uint8Array | null;
	targetRunSha256?: string | null;
}): TargetTaskPart | null =>
	claim.target
		? {
				coefficients: claim.target,
				declared: claim.targetDeclared ?? null,
				run:
					claim.targetRun && claim.targetRunSha256
						? { bytes: new Uint8Array(claim.targetRun), sha256: claim.targetRunSha256 }
						: null
			}
		: null;

/** The exact lower bound on F̃ for the claim's λ, with its cautions; the run re-fitted first. */
export function runTargetCheck(
	bytes: Uint8Array,
	task: CheckTask & { target: TargetTaskPart },
	inputSha256: string
): TargetResult {
	const options = { confidence: task.confidence, claim: task.claim, inputSha256 };
	return certifyClaimTarget(parseCounts(bytes, task.dimension), task.target, options);
}

export interface TargetRunTask {
	run: { bytes: Uint8Array; sha256: string };
	dimension: number;
	/** The claim's counts files so far: the run may equal none of them (witnesses.md §9). */
	counts: { bytes: Uint8Array; sha256: string; name: string }[];
}

export type TargetRunOutcome = { ok: true; fit: TargetFit } | { ok: false; message: string };

/** Pool task: the run read, compared with each counts file of the claim, and fitted. */
export function fitTargetRun(task: TargetRunTask): TargetRunOutcome {
	try {
		const run = parseCounts(task.run.bytes, task.dimension);
		for (const file of task.counts) {
			const counts = parseCounts(file.bytes, task.dimension);
			try {
				requireSeparateRun(run, task.run.sha256, counts, file.sha256);
			} catch (error) {
				throw new InputError(
					`${(error as Error).message} (it equals the counts file ${file.name})`
				);
			}
		}
		return { ok: true, fit: fitTarget(run, task.run.sha256) };
	} catch (error) {
		if (!(error instanceof InputError)) throw error;
		return { ok: false, message: error.message };
	}
}
