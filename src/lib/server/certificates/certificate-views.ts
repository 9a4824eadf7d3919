/** What callers see of a certificate, and where its files and public page are. */
import { isExploratory } from '../../evidence/analyses';
import type { EvidenceManifest } from '../../evidence/manifest';
import { certificateKind, isTrialsManifest, trialsVerdict } from '../../evidence/trials-evidence';
import type { CertificateAttributes } from '../db/models/Certificate';
import type {
	CertificateAnalyses,
	CertificateDoi,
	CertificateUrls,
	CertificateView,
	PublicCertificate
} from '$lib/views/certificates';

export type {
	CertificateAnalyses,
	CertificateKind,
	CertificateUrls,
	CertificateView,
	PublicCertificate
} from '$lib/views/certificates';

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

/** The verdict on the claim: the engine's for counts, the certified number's for trials. */
const verdictOf = (m: EvidenceManifest) =>
	isTrialsManifest(m) ? trialsVerdict(m) : (m.result.claim?.verdict ?? null);

export function certificateAnalyses(m: EvidenceManifest): CertificateAnalyses | null {
	if (!m.analyses) return null;
	const { total, declared, nominalConfidence, list } = m.analyses;
	const exploratory = isExploratory(m.analyses);
	const statedConfidence = m.parameters.confidence;
	return { total, declared, exploratory, nominalConfidence, statedConfidence, list };
}

export function certificateView(
	row: CertificateAttributes,
	doi: CertificateDoi | null = null
): CertificateView {
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
		verdict: verdictOf(m),
		analyses: certificateAnalyses(m),
		urls: certificateUrls(row.id),
		doi,
		...certificateKind(m)
	};
}

export function publicCertificate(
	row: CertificateAttributes,
	doi: CertificateDoi | null = null
): PublicCertificate {
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
		verdict: verdictOf(m),
		// Trials are never background-subtracted (the result has no such field).
		backgroundSubtracted:
			'backgroundSubtracted' in m.result && m.result.backgroundSubtracted === true,
		engineVersion: m.engineVersion,
		analyses: certificateAnalyses(m),
		doi,
		...certificateKind(m)
	};
}
