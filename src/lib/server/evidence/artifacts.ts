/**
 * Everything a certificate consists of, made in memory before anything is stored: the signed
 * manifest, the PDF, the bundle's files and the zip. Issuing then checks the bundle with the same
 * verifier a stranger runs, on the work pool (services/certificates.ts), so that no certificate
 * is issued that would not verify.
 */
import { canonicalJson } from '../../evidence/canonical';
import type { LedgerCheckpoint } from '../../evidence/checkpoint';
import {
	BUNDLE_FILES,
	CALIBRATION_FILE,
	contentsText,
	uploadedCountsName,
	type EvidenceFiles
} from '../../evidence/layout';
import { fingerprintOf, manifestText, type EvidenceManifest } from '../../evidence/manifest';
import { signText, type SigningKey } from '../../evidence/signing';
import { fillPlaceholders } from '../mail/templates';
import { addBundleMetadata } from './bundle-metadata';
import { manifestOf, utf8, type EvidenceContext, type EvidenceInput } from './evidence-input';
import { certificatePdf } from './pdf';
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

export type { EvidenceContext, EvidenceInput } from './evidence-input';

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

const UNKNOWN_CONTEXT: EvidenceContext = {
	group: 'not recorded',
	authors: [],
	sourceDescription: 'not recorded',
	countsFileName: 'not recorded'
};

/** The uploaded file's name in the bundle: counts, or time-ordered trials (trials-evidence.ts). */
const uploadedName = (m: Pick<EvidenceManifest, 'trials' | 'counts'>) =>
	m.trials?.uploadedName ?? uploadedCountsName(m.counts.uploadedFormat);

/** Marks a file-list line the bundle does not have; readmeText drops the line. */
const NO_LINE = '\u0000';

/** The README's lines for the uploaded file and the long-form CSV, as this bundle has them. */
function fileLines(manifest: EvidenceManifest) {
	const name = uploadedName(manifest).padEnd(22);
	return {
		uploadedFile: manifest.trials
			? `  ${name} the trials file exactly as it was uploaded, one row per coincidence in\n` +
				'                         time order (see below)'
			: `  ${name} the counts file exactly as it was uploaded (several files uploaded\n` +
				'                         together: a counts set, each file kept byte for byte after its line)',
		longFormFile: manifest.countsLongForm
			? '  counts-canonical.csv   the same counts as long-form CSV (basis,outcome_a,outcome_b,counts),\n' +
				'                         one row per cell; the verifier reads it back and compares every cell'
			: NO_LINE
	};
}

function readmeText(manifest: EvidenceManifest, fingerprint: string, urls: EvidenceUrls) {
	const filled = fillPlaceholders(readmeSource, {
		certificateId: manifest.certificateId,
		fingerprint,
		keyId: manifest.signingKeyId,
		keysUrl: urls.keys,
		verifyUrl: urls.verify,
		...fileLines(manifest)
	}).replaceAll(`${NO_LINE}\n`, '');
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

interface Signed {
	manifest: EvidenceManifest;
	text: string;
	signature: string;
	fingerprint: string;
	pdf: Uint8Array;
}

/** Every file of the bundle before its metadata and signed contents list. */
async function bundleFiles(
	input: EvidenceInput,
	signed: Signed,
	longForm: { bytes: Uint8Array } | undefined,
	canonical: string,
	key: SigningKey,
	urls: EvidenceUrls,
	published: { keys: { id: string }[] }
): Promise<EvidenceFiles> {
	const { manifest, text, signature, fingerprint, pdf } = signed;
	const calibration = input.calibrationBytes;
	return {
		[uploadedName(manifest)]: input.uploaded,
		[BUNDLE_FILES.canonicalCounts]: utf8(canonical),
		...(longForm ? { [BUNDLE_FILES.canonicalCountsCsv]: longForm.bytes } : {}),
		...(calibration ? { [CALIBRATION_FILE]: calibration } : {}),
		...(manifest.target?.run && input.targetRunBytes
			? { [manifest.target.run.file]: input.targetRunBytes }
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
}

export async function makeEvidence(
	input: EvidenceInput,
	key: SigningKey,
	urls: EvidenceUrls,
	published: { keys: { id: string }[] },
	checkpoint?: LedgerCheckpoint
): Promise<Evidence> {
	const { manifest, parts } = manifestOf(input, key);
	const text = manifestText(manifest);
	const fingerprint = fingerprintOf(text);
	const signature = signText(text, key.secretKey);
	const shown = input.context ?? UNKNOWN_CONTEXT;
	const pdf = await certificatePdf({
		manifest,
		fingerprint,
		signature,
		verifyUrl: urls.verify,
		publicKey: key.publicKey,
		doi: urls.doi,
		context: { ...shown, coincidencesPerBasis: parts.perBasis }
	});
	const signed = { manifest, text, signature, fingerprint, pdf };
	const { longForm, canonical } = parts;
	const files = await bundleFiles(input, signed, longForm, canonical, key, urls, published);
	if (checkpoint)
		files[BUNDLE_FILES.checkpoint] = utf8(JSON.stringify(checkpoint, null, '\t') + '\n');
	const about = { ...shown, fingerprint, verifyUrl: urls.verify, doi: urls.doi };
	addBundleMetadata(files, manifest, key, about);
	signContents(files, fingerprint, manifest.certificateId, key);
	const folder = `rankseal-${manifest.certificateId}`;
	const zip = await zipFiles(files, new Date(manifest.issuedAt), folder);
	return { manifest, manifestText: text, fingerprint, signature, pdf, files, zip };
}
