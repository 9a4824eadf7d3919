/** What callers see of a certificate, on the claim pages and the public /seal page. */
import type { AnalysisEntry } from '$lib/evidence/analyses';
import type { EvidenceClaim } from '$lib/evidence/manifest';
import type { DoiRegistration } from '$lib/doi-registration';

export type CertificateStatus = 'valid' | 'superseded' | 'withdrawn';

/** A certificate's DOI (issue 21) and how far its registration has come. */
export interface CertificateDoi {
	doi: string;
	/** https://doi.org/{doi} with a real registry; the local fake's resolver otherwise. */
	url: string;
	registration: DoiRegistration;
}

/** One author as the certificate names them, with the ORCID iD linked to their account now. */
export interface CertificateAuthor {
	name: string;
	orcid: string | null;
}

/** Counts (i.i.d.) or time-ordered trials (issue 20), with the latter's assumption in words. */
export interface CertificateKind {
	kind: 'counts' | 'time-ordered-trials';
	assumption: string | null;
}

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

export interface CertificateView extends CertificateKind {
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
	/** Its DOI (issue 21); null for a certificate not yet given one. */
	doi: CertificateDoi | null;
}

/** What the public verification page may show: only what the certificate itself shows. */
export interface PublicCertificate extends CertificateKind {
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
	doi: CertificateDoi | null;
}

/** A withdrawn certificate also says why and when, as its ledger entry records. */
export type Lookup =
	| { status: 'unknown' }
	| (PublicCertificate & {
			status: PublicCertificate['status'];
			withdrawal: { reason: string; at: string } | null;
			/** The authors with their ORCID iDs (sign in with ORCID). */
			authors: CertificateAuthor[];
	  });
