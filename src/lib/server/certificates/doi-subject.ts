/**
 * What a certificate's DOI record and its citations say, read from the certificate, its claim
 * and its DOI row: one source for the DataCite metadata, BibTeX, RIS and the plain text.
 */
import type { EvidenceManifest } from '../../evidence/manifest';
import { config } from '../core/config';
import type { Database } from '../db';
import type { CertificateAttributes, CertificateStatus } from '../db/models/Certificate';
import type { DoiCreator } from '../db/models/CertificateDoi';
import { withdrawalOf } from '../ledger/ledger';
import { certificateUrls } from './certificate-views';
import { orcidOf } from './doi-creators';
import { doiLink } from './doi-name';

/** Another certificate this one replaces or is replaced by: its DOI when it has one. */
export interface RelatedCertificate {
	id: string;
	doi: string | null;
	url: string;
}

export interface DoiSubject {
	doi: string;
	doiUrl: string;
	certificateId: string;
	claimTitle: string;
	dimension: number;
	certifiedSchmidtNumber: number;
	issuedAt: string;
	status: CertificateStatus;
	/** The public record the DOI resolves to (/seal/{id}). */
	landingUrl: string;
	manuscriptReference: string | null;
	supersedes: RelatedCertificate | null;
	supersededBy: RelatedCertificate | null;
	withdrawal: { reason: string; at: string } | null;
	creators: { name: string; orcid: string | null }[];
	countsSha256: string;
	fingerprint: string;
	bundleSha256: string;
	bundleName: string;
}

export const PUBLISHER = 'Rankseal';

/** The record's title: the claim's own words, then what was certified. */
export const citationTitle = (
	s: Pick<DoiSubject, 'claimTitle' | 'certifiedSchmidtNumber' | 'dimension'>
) =>
	`${s.claimTitle}: Schmidt-number certificate (Schmidt number ≥ ${s.certifiedSchmidtNumber} in local dimension ${s.dimension})`;

async function related(database: Database, id: string | null): Promise<RelatedCertificate | null> {
	if (!id) return null;
	const row = await database.models.CertificateDoi.findByPk(id);
	const url = certificateUrls(id, config().origin).verify;
	return { id, doi: (row?.get('doi') as string | undefined) ?? null, url };
}

async function creatorsWithOrcid(database: Database, creators: DoiCreator[]) {
	return Promise.all(
		creators.map(async (c) => ({ name: c.name, orcid: await orcidOf(database, c.userId) }))
	);
}

/** The subject of one certificate's DOI; null when the certificate has no DOI row. */
export async function doiSubject(
	database: Database,
	certificate: CertificateAttributes
): Promise<DoiSubject | null> {
	const row = (await database.models.CertificateDoi.findByPk(certificate.id))?.get({ plain: true });
	if (!row) return null;
	const m = JSON.parse(certificate.manifest) as EvidenceManifest;
	const withdrawn = certificate.status === 'withdrawn';
	return {
		doi: row.doi,
		doiUrl: doiLink(row.doi),
		certificateId: certificate.id,
		claimTitle: m.claim.title,
		dimension: m.claim.dimension,
		certifiedSchmidtNumber: m.result.certifiedSchmidtNumber,
		issuedAt: m.issuedAt,
		status: certificate.status,
		landingUrl: certificateUrls(certificate.id, config().origin).verify,
		manuscriptReference: m.claim.manuscriptReference ?? null,
		supersedes: await related(database, certificate.supersedes),
		supersededBy: await related(database, certificate.supersededBy),
		withdrawal: withdrawn ? await withdrawalOf(database, certificate.id) : null,
		creators: await creatorsWithOrcid(database, JSON.parse(row.creators) as DoiCreator[]),
		countsSha256: m.counts.uploadedSha256,
		fingerprint: certificate.fingerprint,
		bundleSha256: certificate.bundleSha256,
		bundleName: `rankseal-evidence-${certificate.id}.zip`
	};
}
