/** The engine run again with the recorded settings, every number compared with the manifest's. */
import { certify, ENGINE_VERSION, parseCounts } from '../certify';
import { certifyClaimTarget } from '../certify/fidelity-target/fitted';
import type { CountsDataset } from '../certify/counts';
import { jsonRoundTrip } from './canonical';
import { alignedRerun, firstDifference } from './compare';
import { CALIBRATION_FILE, uploadedCountsName, type EvidenceFiles } from './layout';
import { certifyOptionsOf, isTargetManifest, type TargetManifest } from './manifest';
import { isTrialsManifest } from './trials-evidence';
import { checkTrialsRerun } from './verify-trials';
import { Failure, type State } from './verify-state';
import { targetOf } from './verify-target';

/** fidelity-target: the check again with the target the manifest names (witnesses.md §4.3′). */
function rerunTarget(m: TargetManifest, dataset: CountsDataset, files: EvidenceFiles) {
	if (!m.target)
		throw new Failure('manifest.json', 'a fidelity-target certificate names no target');
	return certifyClaimTarget(dataset, targetOf(files, m), {
		confidence: m.parameters.confidence,
		claim: m.claim.claimedSchmidtNumber,
		inputSha256: m.counts.uploadedSha256
	});
}

/**
 * Signed numbers of another engine cannot be repeated by this one (engines change their numbers
 * and say so by their version): the re-run is left to the bundle's own verify.mjs, which carries
 * the engine that made them, and the report says it was not done here (verify.ts).
 */
function madeByAnotherEngine(s: State): boolean {
	const m = s.manifest!;
	const resultEngine = m.result.engine?.version;
	if (resultEngine !== m.engineVersion)
		throw new Failure(
			'engine version',
			`the manifest names engine ${m.engineVersion} and its result ${resultEngine ?? 'none'}`
		);
	if (m.engineVersion === ENGINE_VERSION) return false;
	s.otherEngine = m.engineVersion;
	return true;
}

export function checkRerun(s: State) {
	const m = s.manifest!;
	if (madeByAnotherEngine(s)) return;
	if (isTrialsManifest(m)) {
		checkTrialsRerun(s.files, m);
		s.passed.push('re-run');
		return;
	}
	const dataset = parseCounts(
		s.files[uploadedCountsName(m.counts.uploadedFormat)],
		m.claim.dimension
	);
	let rerun: unknown;
	try {
		rerun = jsonRoundTrip(
			isTargetManifest(m)
				? rerunTarget(m, dataset, s.files)
				: certify(dataset, certifyOptionsOf(m, s.files[CALIBRATION_FILE]))
		);
	} catch (error) {
		if (error instanceof Failure) throw error;
		throw new Failure(
			're-run',
			`the engine refused the recorded settings: ${(error as Error).message}`
		);
	}
	// Results recorded before the calibration fields existed (same engine version) lack them.
	const differs = firstDifference(m.result, alignedRerun(m.result, rerun as object));
	if (differs)
		throw new Failure(`re-run: ${differs}`, 'the recorded result differs from the re-run here');
	s.passed.push('re-run');
}
