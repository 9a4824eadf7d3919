/**
 * The worker-thread entry of the check runner, bundled by esbuild into one ES module
 * (scripts/build-worker.mjs): the default task reads the counts, runs the engine and reports
 * progress on a port; the named ones are the pool's short tasks (checks/work-pool.ts).
 * Relative imports only, so that the bundle needs no Kit aliases.
 */
import { readFile } from 'node:fs/promises';
import { certify, InputError, parseCounts, type CertificationResult } from '../../certify';
import { parseCalibration } from '../../certify/calibration';
import { sha256Hex } from '../../evidence/hash';
import type { TrialsResult } from '../../certify/trials';
import type { CheckMessage, CheckTask } from './task';
import { lowerThisThread } from './thread-priority';
import { runTrialsCheck } from './trials-task';
import { runTargetCheck } from './target-task';
import type { TargetResult } from '../../certify/fidelity-target';
import { countsAdvice, type CountsAdvice } from '../../certify/planner/check-counts';

/** A correlation-sum or fidelity result with the counts advice the runner stores beside it. */
export type AdvisedResult = CertificationResult & { countsAdvice: CountsAdvice | null };

// Once per thread, as the module loads: the request thread keeps the processor first.
lowerThisThread();

/** Named tasks (piscina `name`): an upload read against its claim; a bundle; a self-check. */
export { summariseCounts } from './summary';
export { canonicalCounts, selfCheck, verifyBundle } from './evidence-tasks';
export { summariseTrials } from './trials-task';
export { trialsEvidence } from './trials-evidence-task';
export { fitTargetRun } from './target-task';

async function readStored(file: string): Promise<Uint8Array> {
	try {
		return await readFile(file);
	} catch {
		// The path is the server's business; say what is wrong without it.
		throw new InputError('the stored counts file cannot be read');
	}
}

export default async function runCheck(
	task: CheckTask
): Promise<AdvisedResult | TrialsResult | TargetResult> {
	// The runner closes its end of the port once the result is in.
	const post = (message: CheckMessage) => task.port?.postMessage(message);
	post({ type: 'started' });
	const bytes = task.bytes ?? (await readStored(task.datasetPath ?? ''));
	const inputSha256 = sha256Hex(bytes);
	if (task.sha256 && task.sha256 !== inputSha256) {
		throw new InputError('the stored counts file no longer matches its SHA-256');
	}
	if (task.trials) return runTrialsCheck(bytes, { ...task, trials: task.trials }, inputSha256);
	if (task.target) return runTargetCheck(bytes, { ...task, target: task.target }, inputSha256);
	if (task.method === 'fidelity-target')
		throw new InputError(
			'a fidelity-target claim needs its target λ: declared, or fitted on its calibration run'
		);
	const dataset = parseCounts(bytes, task.dimension);
	const calibration = task.calibration
		? {
				calibration: parseCalibration(task.calibration, task.dimension),
				calibrationSha256: sha256Hex(task.calibration)
			}
		: {};
	const options = {
		...calibration,
		method: task.method,
		bases: task.bases,
		fourier: task.fourier,
		resamples: task.resamples,
		confidence: task.confidence,
		seed: task.seed,
		subtractAccidentals: task.subtractAccidentals,
		claim: task.claim,
		inputSha256
	};
	const result = certify(dataset, {
		...options,
		onProgress: (fraction) => post({ type: 'progress', fraction })
	});
	// After the result and outside it: issuing and the verifiers re-run `certify`, never this.
	return { ...result, countsAdvice: countsAdvice(dataset, options, result) };
}
