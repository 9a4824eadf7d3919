/**
 * The signed parts of a bundle: the public key, the signed file list and every file's hash, the
 * manifest and its signature against the published keys, the ledger checkpoint and the in-toto
 * Statement.
 */
import { checkpointSigned, parseCheckpoint } from './checkpoint';
import { sha256Hex } from './hash';
import { BUNDLE_FILES, CONTENTS_FORMAT, keyIdsOfList, type BundleContents } from './layout';
import { fingerprintOf, MANIFEST_FORMAT, type EvidenceManifest } from './manifest';
import { keyIdOf, readHexLine, verifyText } from './signing';
import { statementProblem } from './statement';
import { canonicalFile, Failure, text, type State } from './verify-state';

export function checkContents(s: State) {
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

export function checkManifest(s: State) {
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
export function checkCheckpoint(s: State) {
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
export function checkStatement(s: State) {
	const name = BUNDLE_FILES.statement;
	if (!s.contents!.files[name]) return;
	const problem = statementProblem(text(s.files, name), s.files, s.manifestText!, s.publicKey!);
	if (problem) throw new Failure(problem.item ?? name, problem.message);
	s.passed.push(name);
}
