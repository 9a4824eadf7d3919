/**
 * The evidence manifest: what was certified, from which bytes, with which settings, and the full
 * result. Its canonical JSON text is what gets signed; the SHA-256 of that text is the fingerprint.
 */
import {
	DEFAULT_FOURIER,
	type CertificationResult,
	type CertifyOptions,
	type CountsDataset,
	type FourierConvention
} from '../certify';
import type { EvidenceAnalyses } from './analyses';
import type { TrialsMode } from '../certify/trials';
import type { TargetResult } from '../certify/fidelity-target';
import type { DeclaredTarget } from '../certify/fidelity-target/declared';
import type { ClaimMethod } from '../claims/target';
import { parseCalibration } from '../certify/calibration';
import { canonicalJson, jsonRoundTrip } from './canonical';
import { sha256Hex } from './hash';

/** What a certificate certifies: a witness family's result, or a declared-target fidelity (§4.3′). */
export type CertifiedResult = CertificationResult | TargetResult;

export const MANIFEST_FORMAT = 'rankseal-evidence/1';

/** The manifest's block for a certificate from time-ordered trials (trials-evidence.ts makes it). */
export interface EvidenceTrials {
	kind: 'time-ordered-trials';
	mode: TrialsMode;
	assumption: string;
	/** The bundle's copy of the file as uploaded (gzip-compressed or plain). */
	uploadedName: string;
	gzip: boolean;
}

export interface EvidenceClaim {
	title: string;
	dimension: number;
	method: ClaimMethod;
	bases: number[];
	/** Which Fourier basis basis 1 denotes: the cyclic one unless the claim says otherwise. */
	fourier: FourierConvention;
	claimedSchmidtNumber: number;
	manuscriptReference: string | null;
}

export interface EvidenceParameters {
	resamples: number;
	confidence: number;
	seed: number;
	subtractAccidentals: boolean;
}

export interface EvidenceCounts {
	/** SHA-256 of the counts file exactly as uploaded. */
	uploadedSha256: string;
	uploadedFormat: 'csv' | 'json';
	uploadedBytes: number;
	/** SHA-256 of the canonical counts text (canonicalCountsText). */
	canonicalSha256: string;
}

/** The counts as long-form CSV beside the canonical JSON (issue 18); absent in older bundles. */
export interface EvidenceCountsLongForm {
	file: 'counts-canonical.csv';
	sha256: string;
	bytes: number;
}

/**
 * fidelity-target (witnesses.md §4.3′): the target the certified number holds for, and where it
 * came from; the verifier re-runs the check with exactly these coefficients.
 */
export interface EvidenceTarget extends DeclaredTarget {
	/**
	 * 'declared': with the claim, before the data (the claim's own record); 'calibration-run':
	 * fitted on a separate run and frozen before the first check (§9), the run in the bundle.
	 */
	source: 'declared' | 'calibration-run';
	/** calibration-run only: the run's file in the bundle, as uploaded, with its SHA-256 and size. */
	run?: EvidenceTargetRun;
	/** calibration-run only: how λ was fitted, and the run's matching counts N_mm it used. */
	fit?: { method: 'diagonal-share'; diagonal: number[] };
}

export interface EvidenceTargetRun {
	file: string;
	sha256: string;
	bytes: number;
}

/** The calibration file the check used (witnesses.md §4.4); absent when it used none. */
export interface EvidenceCalibration {
	uploadedSha256: string;
	uploadedBytes: number;
}

export interface EvidenceManifest {
	format: typeof MANIFEST_FORMAT;
	certificateId: string;
	issuedAt: string;
	signingKeyId: string;
	engineVersion: string;
	claimId: string;
	checkId: string;
	supersedes: string | null;
	claim: EvidenceClaim;
	parameters: EvidenceParameters;
	counts: EvidenceCounts;
	/** The long-form CSV of the counts (issue 18); absent in certificates made before it. */
	countsLongForm?: EvidenceCountsLongForm;
	calibration?: EvidenceCalibration;
	/** fidelity-target certificates only. */
	target?: EvidenceTarget;
	result: CertifiedResult;
	/**
	 * Every distinct analysis of these counts up to this certificate (issue 15); absent in
	 * certificates made before it. `parameters.confidence` is then the corrected level.
	 */
	analyses?: EvidenceAnalyses;
	/**
	 * Certificates from time-ordered trials (issue 20): the kind, its assumption and the file; then
	 * `result` is the supermartingale check's (trials-evidence.ts, TrialsManifest). Absent otherwise.
	 */
	trials?: EvidenceTrials;
}

export type ManifestInput = Omit<EvidenceManifest, 'format' | 'result' | 'claim'> & {
	claim: Omit<EvidenceClaim, 'fourier'> & { fourier?: FourierConvention | null };
	result: CertifiedResult;
};

/** The manifest in the form it will be read back (JSON), with the Fourier convention defaulted. */
export function buildManifest(input: ManifestInput): EvidenceManifest {
	return jsonRoundTrip({
		format: MANIFEST_FORMAT,
		...input,
		claim: { ...input.claim, fourier: input.claim.fourier ?? DEFAULT_FOURIER }
	});
}

export const manifestText = (manifest: EvidenceManifest): string => canonicalJson(manifest);

/** The certificate's fingerprint: SHA-256 of the canonical manifest text. */
export const fingerprintOf = (text: string): string => sha256Hex(text);

/**
 * The engine options that reproduce the recorded result (issuance and verification alike); the
 * calibration file's bytes when the manifest names one.
 */
export function certifyOptionsOf(
	manifest: EvidenceManifest,
	calibration?: Uint8Array
): CertifyOptions {
	const { claim, parameters, counts } = manifest;
	return {
		...(manifest.calibration && calibration
			? {
					calibration: parseCalibration(calibration, claim.dimension),
					calibrationSha256: manifest.calibration.uploadedSha256
				}
			: {}),
		method: claim.method,
		bases: claim.bases,
		fourier: claim.fourier,
		resamples: parameters.resamples,
		confidence: parameters.confidence,
		seed: parameters.seed,
		subtractAccidentals: parameters.subtractAccidentals,
		claim: claim.claimedSchmidtNumber,
		inputSha256: counts.uploadedSha256
	};
}

const matrix = (values: Float64Array, present: Uint8Array, d: number) =>
	Array.from({ length: d }, (_, a) =>
		Array.from({ length: d }, (_, b) => (present[a * d + b] ? values[a * d + b] : null))
	);

/**
 * The counts as parsed, in the JSON counts form written canonically (cells the file left out are
 * null; a declared Fourier convention kept): the same numbers give the same text whatever the layout.
 */
export function canonicalCountsText(dataset: CountsDataset): string {
	const d = dataset.dimension;
	return canonicalJson({
		dimension: d,
		...(dataset.declaredFourier ? { fourier: dataset.declaredFourier.convention } : {}),
		tables: dataset.tables.map((t) => ({
			basis: t.basis,
			counts: matrix(t.counts, t.present, d),
			...(t.accidentals ? { accidentals: matrix(t.accidentals, t.present, d) } : {}),
			...(t.durations ? { duration_s: matrix(t.durations, t.present, d) } : {})
		}))
	});
}

/** A manifest of a witness family's result (every certificate before fidelity-target). */
export type WitnessManifest = EvidenceManifest & { result: CertificationResult };
/** A fidelity-target certificate's manifest: its result and the target it holds for. */
export type TargetManifest = EvidenceManifest & { result: TargetResult; target: EvidenceTarget };

export const isTargetManifest = (m: EvidenceManifest): m is TargetManifest =>
	m.claim.method === 'fidelity-target';
