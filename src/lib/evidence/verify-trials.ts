/**
 * The verifier's part for certificates from time-ordered trials (issue 20): the trials file as
 * uploaded (gzip or plain) against the manifest's hash, the summed counts against it, then the
 * supermartingale re-run from the file and every number of the result compared bit for bit.
 */
import type { TrialsData } from '../certify/trials';
import { isGzip, plainTrialsBytes } from '../certify/trials/inflate';
import { parseTrials } from '../certify/trials/parse';
import { rerunTrials } from '../certify/trials/recheck';
import { canonicalJson, jsonRoundTrip } from './canonical';
import { firstDifference } from './compare';
import { sha256Hex } from './hash';
import { BUNDLE_FILES, CALIBRATION_FILE, type EvidenceFiles } from './layout';
import { trialsCountsText, trialsUploadedName, type TrialsManifest } from './trials-evidence';

/** The item that failed and why; verify.ts reports it as any other failure. */
export class TrialsFailure extends Error {
	constructor(
		readonly item: string,
		message: string
	) {
		super(message);
	}
}

function trialsFile(files: EvidenceFiles, m: TrialsManifest): { name: string; bytes: Uint8Array } {
	const name = m.trials.uploadedName;
	if (name !== trialsUploadedName(m.trials.gzip))
		throw new TrialsFailure('manifest.json', `it names an unexpected trials file '${name}'`);
	const bytes = files[name];
	if (!bytes) throw new TrialsFailure(name, 'the file is missing');
	if (
		sha256Hex(bytes) !== m.counts.uploadedSha256 ||
		m.result.inputSha256 !== m.counts.uploadedSha256
	)
		throw new TrialsFailure(name, 'its SHA-256 differs from the manifest');
	if (isGzip(bytes) !== m.trials.gzip)
		throw new TrialsFailure(name, 'the manifest says otherwise about its gzip compression');
	return { name, bytes };
}

function readTrials(name: string, bytes: Uint8Array, m: TrialsManifest): TrialsData {
	try {
		return parseTrials(plainTrialsBytes(bytes), m.claim.dimension, m.result.mode);
	} catch (error) {
		throw new TrialsFailure(name, `the trials cannot be read: ${(error as Error).message}`);
	}
}

/** The file, the summed counts and result.json; returns the items that passed, in order. */
export function checkTrialsCounts(
	files: EvidenceFiles,
	m: TrialsManifest,
	text: (name: string) => string
): string[] {
	const { name, bytes } = trialsFile(files, m);
	const passed = [`${name} (manifest hash)`];
	const canonical = text(BUNDLE_FILES.canonicalCounts);
	if (sha256Hex(canonical) !== m.counts.canonicalSha256)
		throw new TrialsFailure(BUNDLE_FILES.canonicalCounts, 'its SHA-256 differs from the manifest');
	if (canonical !== trialsCountsText(readTrials(name, bytes, m), m.result.bases))
		throw new TrialsFailure(
			BUNDLE_FILES.canonicalCounts,
			'it does not hold the uploaded trials summed'
		);
	passed.push(BUNDLE_FILES.canonicalCounts);
	if (files[CALIBRATION_FILE] || m.calibration)
		throw new TrialsFailure(CALIBRATION_FILE, 'a time-ordered certificate uses no calibration');
	if (text(BUNDLE_FILES.result) !== canonicalJson(m.result))
		throw new TrialsFailure(BUNDLE_FILES.result, 'it differs from the result in the manifest');
	passed.push(BUNDLE_FILES.result);
	return passed;
}

/** The check run again from the file with the recorded settings; the first differing number named. */
export function checkTrialsRerun(files: EvidenceFiles, m: TrialsManifest): void {
	const { name, bytes } = trialsFile(files, m);
	let rerun: unknown;
	try {
		rerun = jsonRoundTrip(rerunTrials(bytes, m.result, m.claim.fourier));
	} catch (error) {
		const message = (error as Error).message;
		throw new TrialsFailure(
			're-run',
			`the engine refused ${name} or the recorded settings: ${message}`
		);
	}
	const differs = firstDifference(m.result, rerun);
	if (differs)
		throw new TrialsFailure(
			`re-run: ${differs}`,
			'the recorded result differs from the re-run here'
		);
}
