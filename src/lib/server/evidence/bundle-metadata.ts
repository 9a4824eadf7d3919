/**
 * Issue 21's readable-by-others files, added to a bundle just before its signed file list: the
 * in-toto Statement (over every evidence file so far) and then the RO-Crate (over those and the
 * Statement). Both end up in contents.json, so the existing signatures cover them too.
 */
import { BUNDLE_FILES, type EvidenceFiles } from '../../evidence/layout';
import type { EvidenceManifest } from '../../evidence/manifest';
import type { SigningKey } from '../../evidence/signing';
import { signStatement } from '../../evidence/statement';
import { crateText } from './ro-crate';

export interface MetadataContext {
	fingerprint: string;
	authors: string[];
	authorOrcids?: (string | null)[];
	doi?: string;
	group: string;
	verifyUrl: string;
}

const utf8 = (text: string) => new TextEncoder().encode(text);

export function addBundleMetadata(
	files: EvidenceFiles,
	manifest: EvidenceManifest,
	key: SigningKey,
	context: MetadataContext
): void {
	const envelope = signStatement(files, manifest, key);
	files[BUNDLE_FILES.statement] = utf8(JSON.stringify(envelope, null, '\t') + '\n');
	files[BUNDLE_FILES.crate] = utf8(crateText({ ...context, manifest, files: { ...files } }));
}
