/** The files of an evidence bundle and the signed list of their hashes (contents.json). */
import { canonicalJson } from './canonical';
import { sha256Hex } from './hash';

export const BUNDLE_FILES = {
	manifest: 'manifest.json',
	signature: 'signature.txt',
	publicKey: 'public-key.txt',
	/** The service's published key list when the bundle was made (as its public endpoint gives it). */
	signingKeys: 'signing-keys.json',
	/** The ledger's signed checkpoint when the bundle was made (bundles since issue 15 part 5). */
	checkpoint: 'checkpoint.json',
	contents: 'contents.json',
	contentsSignature: 'contents.sig',
	/** Issue 21: the in-toto Statement in a DSSE envelope, and the RO-Crate metadata. */
	statement: 'statement.dsse.json',
	crate: 'ro-crate-metadata.json',
	canonicalCounts: 'counts-canonical.json',
	/** The same counts as long-form CSV, one row per basis and outcome pair (issue 18). */
	canonicalCountsCsv: 'counts-canonical.csv',
	result: 'result.json',
	pdf: 'certificate.pdf',
	readme: 'README.txt',
	verifier: 'verify.mjs'
} as const;

/** The measured basis vectors as uploaded (witnesses.md §4.4): only when the check used them. */
export const CALIBRATION_FILE = 'calibration.json';

/** A counts file's format as stored: JSON when it opens with a brace, CSV otherwise. */
export function countsFormatOf(bytes: Uint8Array): 'csv' | 'json' {
	const head = new TextDecoder()
		.decode(bytes.subarray(0, 64))
		.replace(/^\uFEFF/, '')
		.trimStart();
	return head.startsWith('{') ? 'json' : 'csv';
}

/** fidelity-target: the calibration run λ was fitted on, as uploaded (witnesses.md §4.3′). */
export const targetRunName = (format: 'csv' | 'json') => `calibration-run.${format}`;

export const uploadedCountsName = (format: 'csv' | 'json') => `counts-uploaded.${format}`;

export const CONTENTS_FORMAT = 'rankseal-contents/1';

export interface BundleContents {
	format: typeof CONTENTS_FORMAT;
	certificateId: string;
	fingerprint: string;
	/** SHA-256 of every other file of the bundle, by name. */
	files: Record<string, string>;
}

export type EvidenceFiles = Record<string, Uint8Array>;

/** The canonical contents text for these files (all but contents.json and its signature). */
export function contentsText(
	certificateId: string,
	fingerprint: string,
	files: EvidenceFiles
): string {
	const listed = Object.keys(files).filter(
		(name) => name !== BUNDLE_FILES.contents && name !== BUNDLE_FILES.contentsSignature
	);
	const contents: BundleContents = {
		format: CONTENTS_FORMAT,
		certificateId,
		fingerprint,
		files: Object.fromEntries(listed.map((name) => [name, sha256Hex(files[name])]))
	};
	return canonicalJson(contents);
}

/** Key ids from a published key list `{ "keys": [{ "id": … }] }`; null when it is not one. */
export function keyIdsOfList(text: string): string[] | null {
	try {
		const list = JSON.parse(text) as { keys?: { id?: unknown }[] };
		const ids = (list.keys ?? []).map((k) => k.id);
		return ids.length > 0 && ids.every((id) => typeof id === 'string' && /^[0-9a-f]{64}$/.test(id))
			? (ids as string[])
			: null;
	} catch {
		return null;
	}
}
