/**
 * The worker-thread entry of the check runner, bundled by esbuild into one ES module
 * (scripts/build-worker.mjs): reads the counts, runs the engine and reports progress on a port.
 * Relative imports only, so that the bundle needs no Kit aliases.
 */
import { readFile } from 'node:fs/promises';
import { certify, InputError, parseCounts, type CertificationResult } from '../../certify';
import { sha256Hex } from '../../evidence/hash';
import type { TrialsResult } from '../../certify/trials';
import type { CheckMessage, CheckTask } from './task';
import { runTrialsCheck } from './trials-task';

/** Named task (piscina `name`): reads an uploaded file against its claim. */
export { summariseCounts } from './summary';
export { summariseTrials } from './trials-task';

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
): Promise<CertificationResult | TrialsResult> {
	// The runner closes its end of the port once the result is in.
	const post = (message: CheckMessage) => task.port?.postMessage(message);
	post({ type: 'started' });
	const bytes = task.bytes ?? (await readStored(task.datasetPath ?? ''));
	const inputSha256 = sha256Hex(bytes);
	if (task.sha256 && task.sha256 !== inputSha256) {
		throw new InputError('the stored counts file no longer matches its SHA-256');
	}
	if (task.trials) return runTrialsCheck(bytes, { ...task, trials: task.trials }, inputSha256);
	const dataset = parseCounts(bytes, task.dimension);
	return certify(dataset, {
		method: task.method,
		bases: task.bases,
		fourier: task.fourier,
		resamples: task.resamples,
		confidence: task.confidence,
		seed: task.seed,
		subtractAccidentals: task.subtractAccidentals,
		claim: task.claim,
		inputSha256,
		onProgress: (fraction) => post({ type: 'progress', fraction })
	});
}
