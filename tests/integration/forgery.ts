/**
 * An outside forger's bundle: a genuine bundle with one claim field changed, the manifest and the
 * file list re-signed with the forger's own Ed25519 key, and that key put in public-key.txt and
 * in the bundle's own signing-keys.json (its ledger checkpoint and in-toto Statement re-signed with it). Every hash and signature inside agrees; only a key list
 * from outside the bundle can tell.
 */
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { parseCheckpoint, signCheckpoint } from '../../src/lib/evidence/checkpoint';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { BUNDLE_FILES, contentsText, type EvidenceFiles } from '../../src/lib/evidence/layout';
import type { EvidenceManifest } from '../../src/lib/evidence/manifest';
import { newSigningKey, signText, type SigningKey } from '../../src/lib/evidence/signing';
import { signStatement } from '../../src/lib/evidence/statement';

const utf8 = (text: string) => new TextEncoder().encode(text);

/** The forger's default change: the reference is not re-computed, so the bundle re-runs cleanly. */
const newReference = (m: EvidenceManifest): EvidenceManifest => ({
	...m,
	claim: { ...m.claim, manuscriptReference: 'Nature 999, 1 (2027)' }
});

/** `change` edits the manifest (result.json follows its result); `forger` signs everything. */
export function forgeBundle(
	files: EvidenceFiles,
	forger: SigningKey = newSigningKey(),
	change: (m: EvidenceManifest) => EvidenceManifest = newReference
): { files: EvidenceFiles; forger: SigningKey } {
	const manifest = JSON.parse(
		new TextDecoder().decode(files[BUNDLE_FILES.manifest])
	) as EvidenceManifest;
	const changed = change(manifest);
	const forged = canonicalJson({ ...changed, signingKeyId: forger.id });
	const keys = { keys: [{ id: forger.id, algorithm: 'Ed25519', publicKey: forger.publicKey }] };
	const {
		[BUNDLE_FILES.contents]: _contents,
		[BUNDLE_FILES.contentsSignature]: _signature,
		...rest
	} = files;
	const listed: EvidenceFiles = {
		...rest,
		[BUNDLE_FILES.manifest]: utf8(forged),
		[BUNDLE_FILES.result]: utf8(canonicalJson(changed.result)),
		[BUNDLE_FILES.signature]: utf8(signText(forged, forger.secretKey) + '\n'),
		[BUNDLE_FILES.publicKey]: utf8(forger.publicKey + '\n'),
		[BUNDLE_FILES.signingKeys]: utf8(JSON.stringify(keys, null, '\t') + '\n')
	};
	// The ledger checkpoint, if the bundle has one, signed again by the forger too.
	const checkpoint = files[BUNDLE_FILES.checkpoint];
	if (checkpoint) {
		const { entries, head, at } = parseCheckpoint(new TextDecoder().decode(checkpoint))!;
		const forgedCheckpoint = signCheckpoint({ entries, head, at }, forger);
		listed[BUNDLE_FILES.checkpoint] = utf8(JSON.stringify(forgedCheckpoint) + '\n');
	}
	// The in-toto Statement (bundles since issue 21), made again over the forged files.
	if (files[BUNDLE_FILES.statement]) {
		const { [BUNDLE_FILES.statement]: _old, [BUNDLE_FILES.crate]: _crate, ...subjects } = listed;
		const envelope = signStatement(subjects, JSON.parse(forged) as EvidenceManifest, forger);
		listed[BUNDLE_FILES.statement] = utf8(JSON.stringify(envelope) + '\n');
	}
	const list = contentsText(manifest.certificateId, sha256Hex(forged), listed);
	return {
		forger,
		files: {
			...listed,
			[BUNDLE_FILES.contents]: utf8(list),
			[BUNDLE_FILES.contentsSignature]: utf8(signText(list, forger.secretKey) + '\n')
		}
	};
}
