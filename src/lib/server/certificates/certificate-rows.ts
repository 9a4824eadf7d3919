/** The stored form of a new certificate and what its issue entry in the ledger records of it. */
import { sha256Hex } from '../../evidence/hash';
import type { CertificateAttributes } from '../db/models/Certificate';
import type { Evidence } from '../evidence/artifacts';
import { issuerDigest, newIssuerSalt } from '../ledger/issuer-digest';
import type { LedgerRole } from '../ledger/ledger-roles';
import { certificatePaths } from '../storage/certificate-store';

export function certificateRow(
	evidence: Evidence,
	keyId: string,
	issuedBy: string
): CertificateAttributes {
	const m = evidence.manifest;
	return {
		id: m.certificateId,
		claimId: m.claimId,
		checkId: m.checkId,
		fingerprint: evidence.fingerprint,
		manifest: evidence.manifestText,
		signature: evidence.signature,
		keyId,
		status: 'valid',
		supersedes: m.supersedes,
		supersededBy: null,
		...certificatePaths(m.certificateId),
		pdfSha256: sha256Hex(evidence.pdf),
		bundleSha256: sha256Hex(evidence.zip),
		issuedBy,
		issuedAt: new Date(m.issuedAt)
	};
}

/**
 * Every column the manifest does not bind, so that ledger:verify can check them. The issuer is
 * named by role and bound by a salted digest of the account id, never by the id (ledger-roles.ts).
 */
export function issueDetails(
	row: CertificateAttributes,
	issuerRole: LedgerRole
): Record<string, string | null> {
	const { fingerprint, claimId, checkId, supersedes, pdfPath, pdfSha256 } = row;
	const { bundlePath, bundleSha256, issuedBy } = row;
	const issuerSalt = newIssuerSalt();
	return {
		fingerprint,
		claimId,
		checkId,
		supersedes,
		pdfPath,
		pdfSha256,
		bundlePath,
		bundleSha256,
		issuerRole,
		issuerSalt,
		issuerDigest: issuerDigest(issuerSalt, issuedBy)
	};
}
