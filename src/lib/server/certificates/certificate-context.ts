/**
 * What the certificate PDF shows beside the signed manifest: the group, its members as the
 * authors (the claim's creator first) with their ORCID iDs, the source description and the
 * counts file's name.
 */
import { claimAuthors } from '../certificates/certificate-authors';
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DatasetAttributes } from '../db/models/Dataset';
import type { EvidenceContext } from '../evidence/artifacts';

export async function certificateContext(
	database: Database,
	claim: ClaimAttributes,
	dataset: DatasetAttributes
): Promise<EvidenceContext> {
	const group = await database.models.Group.findByPk(claim.groupId);
	// One author list for the PDF, the pages and the DOI's creators.
	const people = await claimAuthors(database, claim);
	return {
		group: (group?.get('name') as string | undefined) ?? 'no group',
		authors: people.map((p) => p.name),
		authorOrcids: people.map((p) => p.orcid ?? null),
		orcids: people.flatMap((p) => (p.orcid ? [{ name: p.name, orcid: p.orcid }] : [])),
		sourceDescription: claim.sourceDescription,
		countsFileName: dataset.originalName,
		// From the upload's summary, so issuing parses nothing on the request thread.
		coincidencesPerBasis: Object.entries(dataset.summary.totals).map(([basis, total]) => ({
			basis: Number(basis),
			total
		}))
	};
}
