/**
 * Everything a certificate consists of, made in memory before anything is stored: the signed
 * manifest, the PDF, the bundle's files and the zip. Issuing then checks the bundle with the same
 * verifier a stranger runs, on the work pool (services/certificates.ts), so that no certificate
 * is issued that would not verify.
 */
import { parseCounts, type CountsDataset } from '../../certify';
import { canonicalJson } from '../../evidence/canonical';
import { longFormCountsText } from '../../evidence/counts-long-form';
import type { LedgerCheckpoint } from '../../evidence/checkpoint';
import { sha256Hex } from '../../evidence/hash';
import {
	BUNDLE_FILES,
	CALIBRATION_FILE,
	contentsText,
	uploadedCountsName,
	type EvidenceFiles
} from '../../evidence/layout';
import {
	buildManifest,
	canonicalCountsText,
	fingerprintOf,
	manifestText,
	type EvidenceManifest,
	type ManifestInput
} from '../../evidence/manifest';
import { signText, type SigningKey } from '../../evidence/signing';
import { fillPlaceholders } from '../mail/templates';
import { addBundleMetadata } from './bundle-metadata';
import { certificatePdf, type CertificateContext } from './pdf';
import { trialsCountsParts } from './trials-parts';
import { targetRunNote } from './target-readme';
import { trialsReadmeNote } from './trials-readme';
import { verifierBytes } from './verifier-file';
import { zipFiles } from './zip-write';

const readmeSource = Object.values(
	import.meta.glob('/templates/evidence/README.txt', {
		query: '?raw',
		import: 'default',
		eager: true
	})
)[0] as string;

export interface EvidenceUrls {
	/** The public page the QR code points to. */
	verify: string;
	/** The public list of signing keys. */
	keys: string;
	/** The certificate's DOI name, fixed at issue (registration follows through the DOI outbox). */
	doi?: string;
}

export interface Evidence {
	manifest: EvidenceManifest;
	manifestText: string;
	fingerprint: string;
	signature: string;
	pdf: Buffer;
	files: EvidenceFiles;
	zip: Buffer;
}

/** Who and what the counts came from, for the PDF only (not signed: the manifest is). */
export type EvidenceContext = Omit<CertificateContext, 'coincidencesPerBasis'> &
	Partial<Pick<CertificateContext, 'coincidencesPerBasis'>>;

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

const UNKNOWN_CONTEXT: EvidenceContext = {
	group: 'not recorded',
	authors: [],
	sourceDescription: 'not recorded',
	countsFileName: 'not recorded'
};

const utf8 = (text: string) => new TextEncoder().encode(text);

/** The counts as long-form CSV and the manifest's record of it (issue 18). */
function longFormPart(dataset: CountsDataset) {
	const bytes = utf8(longFormCountsText(dataset));
	const file = BUNDLE_FILES.canonicalCountsCsv;
	return { bytes, record: { file, sha256: sha256Hex(bytes), bytes: bytes.byteLength } };
}

function countsParts(input: EvidenceInput) {
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

/** The uploaded file's name in the bundle: counts, or time-ordered trials (trials-evidence.ts). */
const uploadedName = (m: Pick<EvidenceManifest, 'trials' | 'counts'>) =>
	m.trials?.uploadedName ?? uploadedCountsName(m.counts.uploadedFormat);

function readmeText(manifest: EvidenceManifest, fingerprint: string, urls: EvidenceUrls) {
	const filled = fillPlaceholders(readmeSource, {
		certificateId: manifest.certificateId,
		fingerprint,
		keyId: manifest.signingKeyId,
		keysUrl: urls.keys,
		verifyUrl: urls.verify,
		uploadedName: uploadedName(manifest).padEnd(22)
	});
	return filled + trialsReadmeNote(manifest) + targetRunNote(manifest);
}

/** Adds the signed list of every file's SHA-256 (contents.json, contents.sig). */
function signContents(
	files: EvidenceFiles,
	fingerprint: string,
	certificateId: string,
	key: SigningKey
) {
	const listed = contentsText(certificateId, fingerprint, files);
	files[BUNDLE_FILES.contents] = utf8(listed);
	files[BUNDLE_FILES.contentsSignature] = utf8(signText(listed, key.secretKey) + '\n');
}

export async function makeEvidence(
	input: EvidenceInput,
	key: SigningKey,
	urls: EvidenceUrls,
	published: { keys: { id: string }[] },
	checkpoint?: LedgerCheckpoint
): Promise<Evidence> {
	// Trials certificates carry the trials file itself; the long-form CSV is of counts files only.
	const { canonical, counts, perBasis, longForm } = input.trials
		? { ...trialsCountsParts({ ...input, trials: input.trials }), longForm: undefined }
		: countsParts(input);
	const {
		uploaded,
		uploadedFormat,
		calibrationBytes: calibration,
		targetRunBytes,
		canonical: _,
		context,
		...rest
	} = input;
	delete (rest as { calibration?: unknown }).calibration;
	const engineVersion = input.result.engine.version;
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
		engineVersion
	});
	const text = manifestText(manifest);
	const fingerprint = fingerprintOf(text);
	const signature = signText(text, key.secretKey);
	const pdf = await certificatePdf({
		manifest,
		fingerprint,
		signature,
		verifyUrl: urls.verify,
		publicKey: key.publicKey,
		doi: urls.doi,
		context: { ...(context ?? UNKNOWN_CONTEXT), coincidencesPerBasis: perBasis }
	});
	const files: EvidenceFiles = {
		[uploadedName(manifest)]: uploaded,
		[BUNDLE_FILES.canonicalCounts]: utf8(canonical),
		...(longForm ? { [BUNDLE_FILES.canonicalCountsCsv]: longForm.bytes } : {}),
		...(calibration ? { [CALIBRATION_FILE]: calibration } : {}),
		...(manifest.target?.run && targetRunBytes
			? { [manifest.target.run.file]: targetRunBytes }
			: {}),
		[BUNDLE_FILES.manifest]: utf8(text),
		[BUNDLE_FILES.signature]: utf8(signature + '\n'),
		[BUNDLE_FILES.publicKey]: utf8(key.publicKey + '\n'),
		[BUNDLE_FILES.signingKeys]: utf8(JSON.stringify(published, null, '\t') + '\n'),
		[BUNDLE_FILES.result]: utf8(canonicalJson(manifest.result)),
		[BUNDLE_FILES.pdf]: pdf,
		[BUNDLE_FILES.readme]: utf8(readmeText(manifest, fingerprint, urls)),
		[BUNDLE_FILES.verifier]: await verifierBytes()
	};
	if (checkpoint)
		files[BUNDLE_FILES.checkpoint] = utf8(JSON.stringify(checkpoint, null, '\t') + '\n');
	const shown = context ?? UNKNOWN_CONTEXT;
	addBundleMetadata(files, manifest, key, { ...shown, fingerprint, verifyUrl: urls.verify });
	signContents(files, fingerprint, manifest.certificateId, key);
	const folder = `rankseal-${manifest.certificateId}`;
	const zip = await zipFiles(files, new Date(manifest.issuedAt), folder);
	return { manifest, manifestText: text, fingerprint, signature, pdf, files, zip };
}
