/** What each bundle file is, in words and as a media type, for the RO-Crate's File entities. */
import { BUNDLE_FILES, CALIBRATION_FILE, targetRunName } from '../../evidence/layout';

const WORDS: Record<string, string> = {
	'counts-uploaded.csv': 'The coincidence counts exactly as uploaded (CSV).',
	'counts-uploaded.json': 'The coincidence counts exactly as uploaded (JSON).',
	[BUNDLE_FILES.canonicalCounts]: 'The counts as parsed, in canonical JSON (RFC 8785).',
	[CALIBRATION_FILE]: 'The measured basis vectors the check used, as uploaded.',
	[targetRunName('csv')]:
		'The separate calibration run the target λ was fitted on, as uploaded (CSV).',
	[targetRunName('json')]:
		'The separate calibration run the target λ was fitted on, as uploaded (JSON).',
	[BUNDLE_FILES.manifest]:
		'The signed manifest (canonical JSON, RFC 8785): counts hashes, claim, settings, result, engine version.',
	[BUNDLE_FILES.signature]: 'Ed25519 signature of manifest.json, hex.',
	[BUNDLE_FILES.publicKey]: 'The Ed25519 public key that signed, hex.',
	[BUNDLE_FILES.signingKeys]: 'The service’s published signing keys when the bundle was made.',
	[BUNDLE_FILES.checkpoint]: 'The ledger’s signed checkpoint just before this certificate.',
	[BUNDLE_FILES.result]: 'The engine’s full result, as in the manifest.',
	[BUNDLE_FILES.pdf]: 'The certificate, PDF/A-3b, with the signed manifest attached inside.',
	[BUNDLE_FILES.readme]: 'How to check this bundle.',
	[BUNDLE_FILES.verifier]: 'The offline verifier: `node verify.mjs` in this folder (Node.js 20+).',
	[BUNDLE_FILES.statement]:
		'An in-toto Statement v1 in a DSSE envelope signed with the manifest’s key: every evidence file’s SHA-256, the manifest as predicate.',
	[BUNDLE_FILES.contents]:
		'The signed list of every other file’s SHA-256 (this metadata file included, so no hash of it here).',
	[BUNDLE_FILES.contentsSignature]: 'Ed25519 signature of contents.json, hex.'
};

const TYPES: Record<string, string> = {
	csv: 'text/csv',
	json: 'application/json',
	txt: 'text/plain',
	sig: 'text/plain',
	pdf: 'application/pdf',
	mjs: 'text/javascript'
};

export const fileWords = (name: string): string => WORDS[name] ?? 'A file of the evidence bundle.';

export const mediaTypeOf = (name: string): string =>
	TYPES[name.slice(name.lastIndexOf('.') + 1)] ?? 'application/octet-stream';
