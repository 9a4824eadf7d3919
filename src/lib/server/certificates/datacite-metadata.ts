/**
 * The DataCite record of a certificate's DOI, in the REST API's JSON:API form. Follows the DataCite
 * Metadata Schema 4.6 (DataCite Metadata Working Group, 2024): the mandatory kernel properties
 * Identifier, Creator, Title, Publisher, PublicationYear and ResourceType (resourceTypeGeneral),
 * plus RelatedIdentifier, Date and Description. Attribute names as in DataCite's REST API guide
 * (support.datacite.org/docs/api-create-dois).
 */
import { citationTitle, PUBLISHER, type DoiSubject, type RelatedCertificate } from './doi-subject';

export const KERNEL_SCHEMA = 'http://datacite.org/schema/kernel-4';
export const RESOURCE_TYPE = 'Schmidt-number certificate with evidence bundle';

export interface RelatedIdentifier {
	relatedIdentifier: string;
	relatedIdentifierType: 'DOI' | 'URL' | 'arXiv';
	relationType: 'IsSupplementTo' | 'IsNewVersionOf' | 'IsPreviousVersionOf';
}

/** The manuscript reference as an identifier the schema knows (DOI, arXiv, URL); else null. */
export function manuscriptIdentifier(reference: string | null): RelatedIdentifier | null {
	const text = reference?.trim() ?? '';
	const relationType = 'IsSupplementTo' as const;
	const doi = /^(?:doi:\s*|https?:\/\/(?:dx\.)?doi\.org\/)?(10\.\d{4,9}\/\S+)$/i.exec(text);
	if (doi) return { relatedIdentifier: doi[1], relatedIdentifierType: 'DOI', relationType };
	const arxiv = /^arxiv:\s*(\d{4}\.\d{4,5}(?:v\d+)?)$/i.exec(text);
	if (arxiv)
		return { relatedIdentifier: `arXiv:${arxiv[1]}`, relatedIdentifierType: 'arXiv', relationType };
	if (/^https?:\/\/\S+$/i.test(text))
		return { relatedIdentifier: text, relatedIdentifierType: 'URL', relationType };
	return null;
}

const version = (
	other: RelatedCertificate,
	relationType: 'IsNewVersionOf' | 'IsPreviousVersionOf'
): RelatedIdentifier =>
	other.doi
		? { relatedIdentifier: other.doi, relatedIdentifierType: 'DOI', relationType }
		: { relatedIdentifier: other.url, relatedIdentifierType: 'URL', relationType };

export function relatedIdentifiers(s: DoiSubject): RelatedIdentifier[] {
	const manuscript = manuscriptIdentifier(s.manuscriptReference);
	return [
		...(manuscript ? [manuscript] : []),
		...(s.supersedes ? [version(s.supersedes, 'IsNewVersionOf')] : []),
		...(s.supersededBy ? [version(s.supersededBy, 'IsPreviousVersionOf')] : [])
	];
}

function descriptions(s: DoiSubject) {
	const abstract =
		`A signed certificate that the coincidence counts (SHA-256 ${s.countsSha256}) show a Schmidt number of at least ${s.certifiedSchmidtNumber} in local dimension ${s.dimension}, ` +
		`with its evidence bundle (counts, signed manifest, result, PDF and an offline verifier). Certificate fingerprint ${s.fingerprint}.`;
	const status =
		s.status === 'withdrawn'
			? `Withdrawn${s.withdrawal ? ` on ${s.withdrawal.at.slice(0, 10)}: ${s.withdrawal.reason}` : ''}. Do not rely on it.`
			: s.status === 'superseded'
				? `Superseded by a newer certificate for the same claim${s.supersededBy?.doi ? ` (${s.supersededBy.doi})` : ''}; it stays readable and verifiable.`
				: null;
	return [
		{ description: abstract, descriptionType: 'Abstract' },
		...(status ? [{ description: status, descriptionType: 'Other' }] : [])
	];
}

function creators(s: DoiSubject) {
	return s.creators.map(({ name, orcid }) => ({
		name,
		nameType: 'Personal',
		nameIdentifiers: orcid
			? [
					{
						nameIdentifier: `https://orcid.org/${orcid}`,
						nameIdentifierScheme: 'ORCID',
						schemeUri: 'https://orcid.org'
					}
				]
			: []
	}));
}

/** The attributes of the DOI record; `publish` makes a new DOI Findable at once. */
export function dataciteAttributes(s: DoiSubject, publish: boolean) {
	const dates = [{ date: s.issuedAt.slice(0, 10), dateType: 'Issued' }];
	if (s.withdrawal) dates.push({ date: s.withdrawal.at.slice(0, 10), dateType: 'Withdrawn' });
	return {
		doi: s.doi,
		...(publish ? { event: 'publish' } : {}),
		creators: creators(s),
		titles: [{ title: citationTitle(s) }],
		publisher: PUBLISHER,
		publicationYear: Number(s.issuedAt.slice(0, 4)),
		types: { resourceTypeGeneral: 'Dataset', resourceType: RESOURCE_TYPE },
		url: s.landingUrl,
		relatedIdentifiers: relatedIdentifiers(s),
		dates,
		descriptions: descriptions(s),
		schemaVersion: KERNEL_SCHEMA
	};
}

export type DataciteAttributes = ReturnType<typeof dataciteAttributes>;
