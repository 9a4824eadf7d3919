/**
 * The bundle as an in-toto Statement v1 (in-toto/attestation spec v1): its subjects are the
 * bundle's evidence files with their SHA-256, its predicate the signed manifest. It travels in a
 * DSSE envelope signed with the manifest's key, so supply-chain tools can read a certificate.
 */
import { canonicalJson } from './canonical';
import { openEnvelope, signEnvelope, type DsseEnvelope } from './dsse';
import { sha256Hex } from './hash';
import type { EvidenceFiles } from './layout';
import type { EvidenceManifest } from './manifest';

export const STATEMENT_TYPE = 'https://in-toto.io/Statement/v1';
export const STATEMENT_PAYLOAD_TYPE = 'application/vnd.in-toto+json';
/** Ours: the predicate is a Rankseal evidence manifest, exactly as manifest.json holds it. */
export const PREDICATE_TYPE = 'urn:rankseal:predicate:evidence-manifest:v1';

export interface StatementSubject {
	name: string;
	digest: { sha256: string };
}

export interface InTotoStatement {
	_type: typeof STATEMENT_TYPE;
	subject: StatementSubject[];
	predicateType: typeof PREDICATE_TYPE;
	predicate: EvidenceManifest;
}

/** The Statement over these files (sorted by name), as canonical JSON text. */
export function statementText(files: EvidenceFiles, manifest: EvidenceManifest): string {
	const subject = Object.keys(files)
		.sort()
		.map((name) => ({ name, digest: { sha256: sha256Hex(files[name]) } }));
	const statement: InTotoStatement = {
		_type: STATEMENT_TYPE,
		subject,
		predicateType: PREDICATE_TYPE,
		predicate: manifest
	};
	return canonicalJson(statement);
}

export function signStatement(
	files: EvidenceFiles,
	manifest: EvidenceManifest,
	key: { id: string; secretKey: string }
): DsseEnvelope {
	return signEnvelope(STATEMENT_PAYLOAD_TYPE, statementText(files, manifest), key);
}

function parsed(text: string): unknown {
	try {
		return JSON.parse(text);
	} catch {
		return null;
	}
}

const isDigest = (s: StatementSubject) =>
	typeof s?.name === 'string' && /^[0-9a-f]{64}$/.test(s?.digest?.sha256 ?? '');

/**
 * What is wrong with an envelope against the bundle (null when nothing): the signature by the
 * manifest's key, the Statement's type, the predicate equal to manifest.json, every subject's
 * digest equal to its file's SHA-256. `item` names the file at fault.
 */
export function statementProblem(
	envelopeText: string,
	files: EvidenceFiles,
	manifestText: string,
	publicKeyHex: string
): { item: string | null; message: string } | null {
	const opened = openEnvelope(parsed(envelopeText), STATEMENT_PAYLOAD_TYPE, publicKeyHex);
	if ('problem' in opened) return { item: null, message: opened.problem };
	const statement = parsed(opened.body) as Partial<InTotoStatement> | null;
	if (statement?._type !== STATEMENT_TYPE || statement.predicateType !== PREDICATE_TYPE)
		return { item: null, message: `not an in-toto Statement v1 of type ${PREDICATE_TYPE}` };
	if (statement.predicate === undefined || canonicalJson(statement.predicate) !== manifestText)
		return { item: null, message: 'its predicate differs from manifest.json' };
	const subjects = Array.isArray(statement.subject) ? statement.subject : [];
	if (subjects.length === 0 || !subjects.every(isDigest))
		return { item: null, message: 'its subjects are not names with SHA-256 digests' };
	for (const { name, digest } of subjects) {
		const bytes = Object.hasOwn(files, name) ? files[name] : undefined;
		if (!bytes) return { item: name, message: 'a subject of the in-toto Statement is missing' };
		if (sha256Hex(bytes) !== digest.sha256)
			return { item: name, message: 'its SHA-256 differs from the in-toto Statement' };
	}
	return null;
}
