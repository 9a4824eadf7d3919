/**
 * The calibration run of a fidelity-target certificate whose λ was fitted on it (witnesses.md
 * §4.3′, §9): present with its hash, not the certified counts, and fitting to the certified λ
 * exactly; then the target the re-run uses. Shared by verify.mjs, the verify command and the server.
 */
import { InputError, type CountsDataset } from '../certify/counts';
import { fitSeparateRun, type ClaimTarget } from '../certify/fidelity-target/fitted';
import { sha256Hex } from './hash';
import type { EvidenceFiles } from './layout';
import type { EvidenceManifest, TargetManifest } from './manifest';

export class TargetFailure extends Error {
	constructor(
		readonly item: string,
		message: string
	) {
		super(message);
	}
}

const RUN_FILE = /^calibration-run\.(csv|json)$/;
const listed = (xs: number[]) => `(${xs.join(', ')})`;

/** The run the manifest names (and only then), re-fitted: the items that passed. */
export function checkTargetRun(
	files: EvidenceFiles,
	m: EvidenceManifest,
	counts: CountsDataset
): string[] {
	const target = m.target;
	if (target?.source !== 'calibration-run') {
		const stray = Object.keys(files).find((name) => RUN_FILE.test(name));
		if (stray)
			throw new TargetFailure(stray, 'a calibration run is present but the manifest names none');
		return [];
	}
	const run = target.run;
	if (!run || !target.fit)
		throw new TargetFailure('manifest.json', 'the target names no calibration run');
	const bytes = files[run.file];
	if (!bytes) throw new TargetFailure(run.file, 'the file is missing');
	if (sha256Hex(bytes) !== run.sha256 || bytes.byteLength !== run.bytes)
		throw new TargetFailure(run.file, 'its SHA-256 differs from the manifest');
	let fit;
	try {
		fit = fitSeparateRun({ bytes, sha256: run.sha256 }, counts, m.counts.uploadedSha256);
	} catch (error) {
		if (error instanceof InputError) throw new TargetFailure(run.file, error.message);
		throw error;
	}
	const same = (a: number[], b: number[]) => a.length === b.length && a.every((x, i) => x === b[i]);
	if (!same(fit.coefficients, target.coefficients) || !same(fit.diagonal, target.fit.diagonal))
		throw new TargetFailure(
			run.file,
			`it fits λ = ${listed(fit.coefficients)}, not the certified λ = ${listed(target.coefficients)}`
		);
	return [`${run.file} (manifest hash)`, `${run.file} (λ re-fitted)`];
}

/** The target the re-run uses: as declared, or with the run it was fitted on. */
export function targetOf(files: EvidenceFiles, m: TargetManifest): ClaimTarget {
	const { coefficients, declared, run } = m.target;
	return {
		coefficients,
		declared,
		run:
			m.target.source === 'calibration-run' && run
				? { bytes: files[run.file], sha256: run.sha256 }
				: null
	};
}
