/**
 * `certify --method fidelity-target --target-from RUN`: λ fitted on a separate calibration run
 * (src/lib/certify/fidelity-target/fit.ts), frozen, and the check run with it. The run may not be
 * the certified counts (§9); the fit and the run's SHA-256 are printed and kept in the JSON.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { InputError, parseCounts, type CountsDataset } from '../lib/certify';
import { fitTarget, requireSeparateRun, type TargetFit } from '../lib/certify/fidelity-target/fit';

export function fitFromRun(
	file: string,
	dimension: number,
	certified: CountsDataset,
	certifiedSha256: string
): TargetFit {
	let bytes: Uint8Array;
	try {
		bytes = readFileSync(file);
	} catch (error) {
		throw new InputError(
			`cannot read --target-from ${file}: ${(error as NodeJS.ErrnoException).code ?? 'error'}`
		);
	}
	const sha256 = createHash('sha256').update(bytes).digest('hex');
	const run = parseCounts(bytes, dimension);
	requireSeparateRun(run, sha256, certified, certifiedSha256);
	return fitTarget(run, sha256);
}

export { fitCaution } from '../lib/certify/fidelity-target/fitted';
