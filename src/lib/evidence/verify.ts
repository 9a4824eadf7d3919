/**
 * Checks an evidence bundle offline: every hash, both signatures, the signing key, the canonical
 * counts, then re-runs the engine with the recorded settings and compares every number. Stops at
 * the first item that fails and names it. Shared by the bundled verify.mjs, the verify command
 * and the server.
 */
import { certify, ENGINE_VERSION, parseCounts } from '../certify';
import { analysesProblem } from './analyses';
import { canonicalJson, jsonRoundTrip, parseCanonical } from './canonical';
import { longFormProblem } from './counts-long-form';
import { checkpointSigned, parseCheckpoint, type LedgerCheckpoint } from './checkpoint';
import { alignedRerun, firstDifference } from './compare';
import { sha256Hex } from './hash';
import {
	BUNDLE_FILES,
	CALIBRATION_FILE,
	CONTENTS_FORMAT,
	keyIdsOfList,
	uploadedCountsName,
	type BundleContents
} from './layout';
import type { EvidenceFiles } from './layout';
import {
	canonicalCountsText,
	certifyOptionsOf,
	fingerprintOf,
	isTargetManifest,
	MANIFEST_FORMAT,
	type EvidenceManifest,
	type TargetManifest
} from './manifest';
import { certifyClaimTarget } from '../certify/fidelity-target/fitted';
import { checkTargetRun, TargetFailure, targetOf } from './verify-target';
import type { CountsDataset } from '../certify/counts';
import { keyIdOf, readHexLine, verifyText } from './signing';
import { statementProblem } from './statement';
import { isTrialsManifest } from './trials-evidence';
import { checkTrialsCounts, checkTrialsRerun, TrialsFailure } from './verify-trials';

export interface VerificationReport {
	valid: boolean;
	/** The first item that failed, e.g. `signature.txt` or `re-run: statistic.lower`. */
	failedItem: string | null;
	message: string;
	certificateId: string | null;
	fingerprint: string | null;
	keyId: string | null;
	/**
	 * True when the signing key was found on a list the caller gave (a saved copy of the service's
	 * list, a pinned fingerprint, or the service's own keys); false when only the bundle's own
	 * signing-keys.json vouches for it, which anyone who re-signs a bundle can write.
	 */
	anchored: boolean;
	/** The ledger checkpoint the bundle carries, signed by its key; null in older bundles. */
	checkpoint: LedgerCheckpoint | null;
	/** The items that passed, in the order checked. */
	passed: string[];
}

export interface VerifyOptions {
	/**
	 * Key ids the service has published (a saved copy of its list, or one pinned fingerprint);
	 * without it, the list the bundle carries (signing-keys.json), and the report says the key is
	 * not anchored. A key outside the list is refused.
	 */
	trustedKeyIds?: string[];
}

class Failure extends Error {
	constructor(
		readonly item: string,
		message: string
	) {
		super(message);
	}
}

const decoder = new TextDecoder('utf-8', { fatal: true });

function text(files: EvidenceFiles, name: string): string {
	const bytes = files[name];
	if (!bytes) throw new Failure(name, 'the file is missing');
	try {
		return decoder.decode(bytes);
	} catch {
		throw new Failure(name, 'the file is not UTF-8 text');
	}
}

function canonicalFile<T>(files: EvidenceFiles, name: string): T {
	const value = parseCanonical(text(files, name));
	if (value === null || typeof value !== 'object')
		throw new Failure(name, 'not canonical JSON (RFC 8785): the file was changed');
	return value as T;
}

interface State {
	files: EvidenceFiles;
	options: VerifyOptions;
	passed: string[];
	publicKey?: string;
	keyId?: string;
	contents?: BundleContents;
	manifestText?: string;
	manifest?: EvidenceManifest;
	fingerprint?: string;
	checkpoint?: LedgerCheckpoint;
}

function checkContents(s: State) {
	const publicKey = readHexLine(text(s.files, BUNDLE_FILES.publicKey), 32);
	if (!publicKey) throw new Failure(BUNDLE_FILES.publicKey, 'not one line of 64 hex digits');
	s.publicKey = publicKey;
	s.keyId = keyIdOf(publicKey);
	s.passed.push(BUNDLE_FILES.publicKey);
	const contentsText = text(s.files, BUNDLE_FILES.contents);
	const contents = canonicalFile<BundleContents>(s.files, BUNDLE_FILES.contents);
	if (contents.format !== CONTENTS_FORMAT || typeof contents.files !== 'object')
		throw new Failure(BUNDLE_FILES.contents, `not a ${CONTENTS_FORMAT} file list`);
	const signature = readHexLine(text(s.files, BUNDLE_FILES.contentsSignature), 64);
	if (!signature || !verifyText(contentsText, signature, publicKey))
		throw new Failure(BUNDLE_FILES.contentsSignature, 'the file list is not signed by this key');
	s.contents = contents;
	s.passed.push(BUNDLE_FILES.contents, BUNDLE_FILES.contentsSignature);
	for (const [name, expected] of Object.entries(contents.files)) {
		if (!s.files[name]) throw new Failure(name, 'the file is missing');
		if (sha256Hex(s.files[name]) !== expected)
			throw new Failure(name, 'its SHA-256 differs from the signed file list');
		s.passed.push(name);
	}
	// A file the signed list does not name was put there by someone else: the bundle is not as made.
	const signed = new Set([...Object.keys(contents.files), BUNDLE_FILES.contents]);
	signed.add(BUNDLE_FILES.contentsSignature);
	const planted = Object.keys(s.files).find((name) => !signed.has(name));
	if (planted) throw new Failure(planted, 'the file is not in the signed file list');
}

function checkManifest(s: State) {
	const name = BUNDLE_FILES.manifest;
	s.manifestText = text(s.files, name);
	const manifest = canonicalFile<EvidenceManifest>(s.files, name);
	if (manifest.format !== MANIFEST_FORMAT)
		throw new Failure(name, `not a ${MANIFEST_FORMAT} manifest`);
	s.fingerprint = fingerprintOf(s.manifestText);
	if (!s.contents!.files[name] || s.contents!.fingerprint !== s.fingerprint)
		throw new Failure(name, 'its fingerprint differs from the signed file list');
	if (s.contents!.certificateId !== manifest.certificateId)
		throw new Failure(name, 'its certificate id differs from the signed file list');
	s.manifest = manifest;
	if (manifest.signingKeyId !== s.keyId)
		throw new Failure('signing key', 'the manifest names another signing key than public-key.txt');
	const trusted = s.options.trustedKeyIds ?? keyIdsOfList(text(s.files, BUNDLE_FILES.signingKeys));
	if (!trusted) throw new Failure(BUNDLE_FILES.signingKeys, 'not a list of published keys');
	if (!trusted.includes(s.keyId!))
		throw new Failure('signing key', `key ${s.keyId} is not among the service's published keys`);
	s.passed.push(name, 'signing key');
	const signature = readHexLine(text(s.files, BUNDLE_FILES.signature), 64);
	if (!signature || !verifyText(s.manifestText, signature, s.publicKey!))
		throw new Failure(BUNDLE_FILES.signature, 'the manifest is not signed by this key');
	s.passed.push(BUNDLE_FILES.signature);
}

/** The ledger checkpoint, when the signed file list names one: signed by the bundle's key. */
function checkCheckpoint(s: State) {
	const name = BUNDLE_FILES.checkpoint;
	if (!s.contents!.files[name]) return;
	const checkpoint = parseCheckpoint(text(s.files, name));
	if (!checkpoint || checkpoint.keyId !== s.keyId || !checkpointSigned(checkpoint, s.publicKey!))
		throw new Failure(name, 'not a ledger checkpoint signed by the bundle’s key');
	s.checkpoint = checkpoint;
	s.passed.push(name);
}

/**
 * The in-toto Statement, when the signed file list names one (bundles since issue 21). Checked
 * last: it restates what the items before it check, which name a fault more precisely.
 */
function checkStatement(s: State) {
	const name = BUNDLE_FILES.statement;
	if (!s.contents!.files[name]) return;
	const problem = statementProblem(text(s.files, name), s.files, s.manifestText!, s.publicKey!);
	if (problem) throw new Failure(problem.item ?? name, problem.message);
	s.passed.push(name);
}

function checkCounts(s: State) {
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
function checkAnalyses(s: State) {
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

function checkRerun(s: State) {
	const m = s.manifest!;
	if (isTrialsManifest(m)) {
		checkTrialsRerun(s.files, m);
		s.passed.push('re-run');
		return;
	}
	if (m.engineVersion !== ENGINE_VERSION || m.result.engine?.version !== ENGINE_VERSION)
		throw new Failure(
			'engine version',
			`recorded with engine ${m.engineVersion}; this verifier has engine ${ENGINE_VERSION}`
		);
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

export function verifyEvidence(
	files: EvidenceFiles,
	options: VerifyOptions = {}
): VerificationReport {
	const s: State = { files, options, passed: [] };
	const report = (failedItem: string | null, message: string): VerificationReport => ({
		valid: failedItem === null,
		failedItem,
		message,
		certificateId: s.manifest?.certificateId ?? s.contents?.certificateId ?? null,
		fingerprint: s.fingerprint ?? s.contents?.fingerprint ?? null,
		keyId: s.keyId ?? null,
		anchored: options.trustedKeyIds !== undefined,
		checkpoint: s.checkpoint ?? null,
		passed: s.passed
	});
	try {
		checkContents(s);
		checkManifest(s);
		checkCheckpoint(s);
		checkCounts(s);
		checkAnalyses(s);
		checkRerun(s);
		checkStatement(s);
	} catch (error) {
		if (
			error instanceof Failure ||
			error instanceof TrialsFailure ||
			error instanceof TargetFailure
		)
			return report(error.item, error.message);
		return report('bundle', `cannot be checked: ${(error as Error).message}`);
	}
	return report(null, 'every hash, both signatures and the re-run agree');
}
