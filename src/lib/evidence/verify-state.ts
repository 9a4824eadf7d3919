/**
 * What the offline checks share: the failure they stop at, the bundle's files read as text or
 * canonical JSON, and what one check learns for the next (the key, the file list, the manifest).
 */
import type { LedgerCheckpoint } from './checkpoint';
import { parseCanonical } from './canonical';
import type { BundleContents, EvidenceFiles } from './layout';
import type { EvidenceManifest } from './manifest';

export interface VerifyOptions {
	/**
	 * Key ids the service has published (a saved copy of its list, or one pinned fingerprint);
	 * without it, the list the bundle carries (signing-keys.json), and the report says the key is
	 * not anchored. A key outside the list is refused.
	 */
	trustedKeyIds?: string[];
}

export class Failure extends Error {
	constructor(
		readonly item: string,
		message: string
	) {
		super(message);
	}
}

const decoder = new TextDecoder('utf-8', { fatal: true });

export function text(files: EvidenceFiles, name: string): string {
	const bytes = files[name];
	if (!bytes) throw new Failure(name, 'the file is missing');
	try {
		return decoder.decode(bytes);
	} catch {
		throw new Failure(name, 'the file is not UTF-8 text');
	}
}

export function canonicalFile<T>(files: EvidenceFiles, name: string): T {
	const value = parseCanonical(text(files, name));
	if (value === null || typeof value !== 'object')
		throw new Failure(name, 'not canonical JSON (RFC 8785): the file was changed');
	return value as T;
}

export interface State {
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
	/** The engine the bundle was made with, when it is not this verifier's (no re-run here). */
	otherEngine?: string;
}
