/** What callers see of a certificate, on the claim pages and the public /seal page. */
import type { AnalysisEntry } from '$lib/evidence/analyses';
import type { EvidenceClaim } from '$lib/evidence/manifest';

export type CertificateStatus = 'valid' | 'superseded' | 'withdrawn';

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

/** A withdrawn certificate also says why and when, as its ledger entry records. */
export type Lookup =
	| { status: 'unknown' }
	| (PublicCertificate & {
			status: PublicCertificate['status'];
			withdrawal: { reason: string; at: string } | null;
	  });
