/**
 * What a certificate is made from (the input) and its manifest: the counts parts (canonical text,
 * long-form CSV, coincidences per basis) and the manifest that records them and the signing key.
 */
import { parseCounts, type CountsDataset } from '../../certify';
import { longFormCountsText } from '../../evidence/counts-long-form';
import { sha256Hex } from '../../evidence/hash';
import { BUNDLE_FILES } from '../../evidence/layout';
import { buildManifest, canonicalCountsText, type ManifestInput } from '../../evidence/manifest';
import type { SigningKey } from '../../evidence/signing';
import type { CertificateContext } from './pdf';
import { trialsCountsParts } from './trials-parts';

/** Who and what the counts came from, for the PDF only (not signed: the manifest is). */
export type EvidenceContext = Omit<CertificateContext, 'coincidencesPerBasis'> &
	Partial<Pick<CertificateContext, 'coincidencesPerBasis'>> & {
		/** Each author's ORCID iD or null, in the order of `authors` (for the RO-Crate's @ids). */
		authorOrcids?: (string | null)[];
	};

export type EvidenceInput = Omit<
	ManifestInput,
	'counts' | 'signingKeyId' | 'engineVersion' | 'calibration' | 'countsLongForm'
> & {
	uploaded: Uint8Array;
	uploadedFormat: 'csv' | 'json';
	/** The calibration file the check used, as uploaded. */
	calibrationBytes?: Uint8Array | null;
	/** fidelity-target: the calibration run λ was fitted on (manifest `target.run` names it). */
	targetRunBytes?: Uint8Array | null;
	/** The canonical counts text when the caller has it (the service reads it on the work pool). */
	canonical?: string;
	context?: EvidenceContext;
};

export const utf8 = (text: string) => new TextEncoder().encode(text);

/** The counts as long-form CSV and the manifest's record of it (issue 18). */
function longFormPart(dataset: CountsDataset) {
	const bytes = utf8(longFormCountsText(dataset));
	const file = BUNDLE_FILES.canonicalCountsCsv;
	return { bytes, record: { file, sha256: sha256Hex(bytes), bytes: bytes.byteLength } };
}

export function countsParts(input: EvidenceInput) {
	// Parsed here even when the caller brings the canonical text: the long-form CSV needs the tables.
	const dataset = parseCounts(input.uploaded, input.claim.dimension);
	const canonical = input.canonical ?? canonicalCountsText(dataset);
	// Coincidences in each basis the claim uses, for the certificate's page one.
	const given = input.context?.coincidencesPerBasis;
	const perBasis =
		given?.filter((b) => input.claim.bases.includes(b.basis)) ??
		input.claim.bases.map((basis) => {
			const table = dataset.tables.find((t) => t.basis === basis);
			return { basis, total: table ? table.counts.reduce((sum, c) => sum + c, 0) : 0 };
		});
	const counts = {
		uploadedSha256: sha256Hex(input.uploaded),
		uploadedFormat: input.uploadedFormat,
		uploadedBytes: input.uploaded.byteLength,
		canonicalSha256: sha256Hex(canonical)
	};
	return { canonical, counts, perBasis, longForm: longFormPart(dataset) };
}

/** The manifest of the input (its counts parts, calibration and signing key recorded), and the counts parts. */
export function manifestOf(input: EvidenceInput, key: SigningKey) {
	// Trials certificates carry the trials file itself; the long-form CSV is of counts files only.
	const parts = input.trials
		? { ...trialsCountsParts({ ...input, trials: input.trials }), longForm: undefined }
		: countsParts(input);
	const { counts, longForm } = parts;
	const {
		uploaded: _u,
		uploadedFormat: _f,
		calibrationBytes: calibration,
		targetRunBytes: _r,
		canonical: _,
		context: _c,
		...rest
	} = input;
	delete (rest as { calibration?: unknown }).calibration;
	const manifest = buildManifest({
		...rest,
		counts,
		...(longForm ? { countsLongForm: longForm.record } : {}),
		...(calibration
			? {
					calibration: {
						uploadedSha256: sha256Hex(calibration),
						uploadedBytes: calibration.byteLength
					}
				}
			: {}),
		signingKeyId: key.id,
		engineVersion: input.result.engine.version
	});
	return { manifest, parts };
}
