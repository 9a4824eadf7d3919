/**
 * The counts a bundle carries: the upload against the manifest's hash, the canonical and
 * long-form copies holding its very cells, the calibration file, result.json and the analyses
 * behind the stated level. Time-ordered trials are checked by verify-trials.ts.
 */
import { parseCounts, type CountsDataset } from '../certify';
import { analysesProblem } from './analyses';
import { canonicalJson } from './canonical';
import { longFormProblem } from './counts-long-form';
import { sha256Hex } from './hash';
import { BUNDLE_FILES, CALIBRATION_FILE, uploadedCountsName } from './layout';
import { canonicalCountsText } from './manifest';
import { isTrialsManifest } from './trials-evidence';
import { checkTrialsCounts } from './verify-trials';
import { checkTargetRun } from './verify-target';
import { Failure, text, type State } from './verify-state';

export function checkCounts(s: State) {
	const m = s.manifest!;
	// Time-ordered trials (verify-trials.ts): their file, the summed counts and result.json.
	if (isTrialsManifest(m)) {
		s.passed.push(...checkTrialsCounts(s.files, m, (n) => text(s.files, n)));
		return;
	}
	const name = uploadedCountsName(m.counts.uploadedFormat);
	const uploaded = s.files[name];
	if (!uploaded) throw new Failure(name, 'the file is missing');
	if (
		sha256Hex(uploaded) !== m.counts.uploadedSha256 ||
		m.result.inputSha256 !== m.counts.uploadedSha256
	)
		throw new Failure(name, 'its SHA-256 differs from the manifest');
	s.passed.push(`${name} (manifest hash)`);
	const canonical = text(s.files, BUNDLE_FILES.canonicalCounts);
	if (sha256Hex(canonical) !== m.counts.canonicalSha256)
		throw new Failure(BUNDLE_FILES.canonicalCounts, 'its SHA-256 differs from the manifest');
	let expected: string;
	let dataset: CountsDataset;
	try {
		dataset = parseCounts(uploaded, m.claim.dimension);
		expected = canonicalCountsText(dataset);
	} catch (error) {
		throw new Failure(name, `the counts cannot be read: ${(error as Error).message}`);
	}
	if (canonical !== expected)
		throw new Failure(BUNDLE_FILES.canonicalCounts, 'it does not hold the uploaded counts');
	s.passed.push(BUNDLE_FILES.canonicalCounts);
	checkCountsLongForm(s, uploaded);
	checkCalibration(s);
	// fidelity-target with λ fitted on a calibration run (verify-target.ts): the run and the fit.
	s.passed.push(...checkTargetRun(s.files, m, dataset));
	if (text(s.files, BUNDLE_FILES.result) !== canonicalJson(m.result))
		throw new Failure(BUNDLE_FILES.result, 'it differs from the result in the manifest');
	s.passed.push(BUNDLE_FILES.result);
}

/** The long-form CSV the manifest names (and only then): its hash, and the upload's very cells. */
function checkCountsLongForm(s: State, uploaded: Uint8Array) {
	const m = s.manifest!;
	const name = BUNDLE_FILES.canonicalCountsCsv;
	if (!m.countsLongForm) {
		if (s.files[name]) throw new Failure(name, 'the file is present but the manifest names none');
		return;
	}
	const bytes = s.files[name];
	if (!bytes || m.countsLongForm.file !== name) throw new Failure(name, 'the file is missing');
	if (sha256Hex(bytes) !== m.countsLongForm.sha256 || bytes.byteLength !== m.countsLongForm.bytes)
		throw new Failure(name, 'its SHA-256 differs from the manifest');
	const problem = longFormProblem(bytes, parseCounts(uploaded, m.claim.dimension));
	if (problem) throw new Failure(name, problem);
	s.passed.push(name);
}

/** The stated level must be the one corrected for the analyses the certificate lists. */
export function checkAnalyses(s: State) {
	const m = s.manifest!;
	if (!m.analyses) return;
	const problem = analysesProblem(m.analyses, m.parameters.confidence);
	if (problem) throw new Failure('analyses', problem);
	s.passed.push('analyses');
}

/** The calibration file the manifest names (and only then) must be there, with its hash. */
function checkCalibration(s: State) {
	const m = s.manifest!;
	const name = CALIBRATION_FILE;
	const recorded = 'calibration' in m.result ? (m.result.calibration?.sha256 ?? null) : null;
	if (!m.calibration) {
		if (s.files[name] || recorded)
			throw new Failure(name, 'a calibration is present but the manifest names none');
		return;
	}
	const bytes = s.files[name];
	if (!bytes) throw new Failure(name, 'the file is missing');
	if (
		sha256Hex(bytes) !== m.calibration.uploadedSha256 ||
		recorded !== m.calibration.uploadedSha256
	)
		throw new Failure(name, 'its SHA-256 differs from the manifest');
	s.passed.push(`${name} (manifest hash)`);
}
