/**
 * What the local fake registry demands of a DOI record before it becomes Findable: the mandatory
 * properties of the DataCite Metadata Schema 4.6 (Identifier, Creator, Title, Publisher,
 * PublicationYear, ResourceType with resourceTypeGeneral) and, when given, well-formed related
 * identifiers and ORCID name identifiers, from the schema's controlled lists.
 */
import { z } from 'zod';

/** resourceTypeGeneral, DataCite Metadata Schema 4.6 controlled list (Appendix 1, Table 9). */
export const RESOURCE_TYPES_GENERAL = [
	...['Audiovisual', 'Award', 'Book', 'BookChapter', 'Collection', 'ComputationalNotebook'],
	...['ConferencePaper', 'ConferenceProceeding', 'DataPaper', 'Dataset', 'Dissertation', 'Event'],
	...['Image', 'Instrument', 'InteractiveResource', 'Journal', 'JournalArticle', 'Model'],
	...['OutputManagementPlan', 'PeerReview', 'PhysicalObject', 'Preprint', 'Project', 'Report'],
	...['Service', 'Software', 'Sound', 'Standard', 'StudyRegistration', 'Text', 'Workflow', 'Other']
] as const;

/** relatedIdentifierType, same schema (Table 8). */
const RELATED_TYPES = [
	...['ARK', 'arXiv', 'bibcode', 'CSTR', 'DOI', 'EAN13', 'EISSN', 'Handle', 'IGSN', 'ISBN'],
	...['ISSN', 'ISTC', 'LISSN', 'LSID', 'PMID', 'PURL', 'RRID', 'UPC', 'URL', 'URN', 'w3id']
] as const;

/** relationType, same schema (Table 7). */
const RELATION_TYPES = [
	...['IsCitedBy', 'Cites', 'IsSupplementTo', 'IsSupplementedBy', 'IsContinuedBy', 'Continues'],
	...['Describes', 'IsDescribedBy', 'HasMetadata', 'IsMetadataFor', 'HasVersion', 'IsVersionOf'],
	...['IsNewVersionOf', 'IsPreviousVersionOf', 'IsPartOf', 'HasPart', 'IsPublishedIn'],
	...['IsReferencedBy', 'References', 'IsDocumentedBy', 'Documents', 'IsCompiledBy', 'Compiles'],
	...['IsVariantFormOf', 'IsOriginalFormOf', 'IsIdenticalTo', 'IsReviewedBy', 'Reviews'],
	...['IsDerivedFrom', 'IsSourceOf', 'IsRequiredBy', 'Requires', 'IsObsoletedBy', 'Obsoletes'],
	...['IsCollectedBy', 'Collects', 'IsTranslationOf', 'HasTranslation']
] as const;

const text = z.string().trim().min(1, "can't be blank");
/** An ORCID iD as a URL; the last character is a checksum digit or X (ISO 7064 11,2). */
const ORCID_URL = /^https:\/\/orcid\.org\/\d{4}-\d{4}-\d{4}-\d{3}[\dX]$/;

const nameIdentifier = z
	.object({ nameIdentifier: text, nameIdentifierScheme: text })
	.refine((n) => n.nameIdentifierScheme !== 'ORCID' || ORCID_URL.test(n.nameIdentifier), {
		message: 'an ORCID name identifier must be https://orcid.org/0000-0000-0000-000X'
	});

/** A record that may be Findable. */
export const findableRecord = z.object({
	doi: text,
	creators: z
		.array(z.object({ name: text, nameIdentifiers: z.array(nameIdentifier).optional() }))
		.min(1, "can't be blank"),
	titles: z.array(z.object({ title: text })).min(1, "can't be blank"),
	publisher: z.union([text, z.object({ name: text })]),
	publicationYear: z.coerce.number().int().min(1000).max(9999),
	types: z.object({ resourceTypeGeneral: z.enum(RESOURCE_TYPES_GENERAL) }),
	url: z
		.string()
		.url()
		.refine((u) => /^https?:/.test(u), 'must be an http(s) URL'),
	relatedIdentifiers: z
		.array(
			z.object({
				relatedIdentifier: text,
				relatedIdentifierType: z.enum(RELATED_TYPES),
				relationType: z.enum(RELATION_TYPES)
			})
		)
		.optional()
});

/** JSON:API errors naming each property that failed (source: the attribute path). */
export function recordErrors(attributes: unknown): { source: string; title: string }[] {
	const parsed = findableRecord.safeParse(attributes);
	if (parsed.success) return [];
	return parsed.error.issues.map((issue) => ({
		source: issue.path.join('.') || 'data',
		title: issue.message
	}));
}
