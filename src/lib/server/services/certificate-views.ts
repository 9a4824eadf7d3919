/** What callers see of a certificate, and where its files and public page are. */
import { isExploratory, type AnalysisEntry } from '../../evidence/analyses';
import type { EvidenceClaim, EvidenceManifest } from '../../evidence/manifest';
import type { CertificateAttributes, CertificateStatus } from '../db/models/Certificate';

export interface CertificateUrls {
	pdf: string;
	bundle: string;
	/** The public verification page (the QR code's target). */
	verify: string;
}

/** The analyses of the certificate's counts up to it; null for certificates made before issue 15. */
export interface CertificateAnalyses {
	total: number;
	declared: boolean;
	/** Not the declared analysis alone: stated at the corrected level. */
	exploratory: boolean;
	nominalConfidence: number;
	statedConfidence: number;
	list: AnalysisEntry[];
}

export interface CertificateView {
	id: string;
	claimId: string;
	checkId: string;
	fingerprint: string;
	status: CertificateStatus;
	supersedes: string | null;
	supersededBy: string | null;
	keyId: string;
	issuedAt: string;
	certifiedSchmidtNumber: number;
	verdict: 'supported' | 'not supported' | null;
	analyses: CertificateAnalyses | null;
	urls: CertificateUrls;
}

/** What the public verification page may show: only what the certificate itself shows. */
export interface PublicCertificate {
	id: string;
	fingerprint: string;
	status: CertificateStatus;
	issuedAt: string;
	supersedes: string | null;
	supersededBy: string | null;
	keyId: string;
	claim: EvidenceClaim;
	certifiedSchmidtNumber: number;
	verdict: 'supported' | 'not supported' | null;
	backgroundSubtracted: boolean;
	engineVersion: string;
	analyses: CertificateAnalyses | null;
}

export const PUBLIC_VERIFY_PATH = '/seal';
export const PUBLIC_KEYS_PATH = '/api/v1/signing-keys';

export const certificateUrls = (id: string, origin = ''): CertificateUrls => ({
	pdf: `${origin}/api/v1/certificates/${id}/pdf`,
	bundle: `${origin}/api/v1/certificates/${id}/bundle`,
	verify: `${origin}${PUBLIC_VERIFY_PATH}/${id}`
});

/** The absolute addresses printed in the PDF and README. */
export const evidenceUrls = (origin: string, id: string) => ({
	verify: certificateUrls(id, origin).verify,
	keys: `${origin}${PUBLIC_KEYS_PATH}`
});

const manifestOf = (row: CertificateAttributes) => JSON.parse(row.manifest) as EvidenceManifest;

export function certificateAnalyses(m: EvidenceManifest): CertificateAnalyses | null {
	if (!m.analyses) return null;
	const { total, declared, nominalConfidence, list } = m.analyses;
	const exploratory = isExploratory(m.analyses);
	const statedConfidence = m.parameters.confidence;
	return { total, declared, exploratory, nominalConfidence, statedConfidence, list };
}

export function certificateView(row: CertificateAttributes): CertificateView {
	const m = manifestOf(row);
	return {
		id: row.id,
		claimId: row.claimId,
		checkId: row.checkId,
		fingerprint: row.fingerprint,
		status: row.status,
		supersedes: row.supersedes,
		supersededBy: row.supersededBy,
		keyId: row.keyId,
		issuedAt: m.issuedAt,
		certifiedSchmidtNumber: m.result.certifiedSchmidtNumber,
		verdict: m.result.claim?.verdict ?? null,
		analyses: certificateAnalyses(m),
		urls: certificateUrls(row.id)
	};
}

export function publicCertificate(row: CertificateAttributes): PublicCertificate {
	const m = manifestOf(row);
	return {
		id: row.id,
		fingerprint: row.fingerprint,
		status: row.status,
		issuedAt: m.issuedAt,
		supersedes: row.supersedes,
		supersededBy: row.supersededBy,
		keyId: row.keyId,
		claim: m.claim,
		certifiedSchmidtNumber: m.result.certifiedSchmidtNumber,
		verdict: m.result.claim?.verdict ?? null,
		backgroundSubtracted: 'backgroundSubtracted' in m.result && m.result.backgroundSubtracted,
		engineVersion: m.engineVersion,
		analyses: certificateAnalyses(m)
	};
}
