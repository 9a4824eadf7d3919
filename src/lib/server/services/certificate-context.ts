/**
 * What the certificate PDF shows beside the signed manifest: the group, its members as the
 * authors (the claim's creator first), the source description and the counts file's name.
 */
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DatasetAttributes } from '../db/models/Dataset';
import type { EvidenceContext } from '../evidence/artifacts';
import { authorsOf } from '../certificates/doi-creators';

export async function certificateContext(
	database: Database,
	claim: ClaimAttributes,
	dataset: DatasetAttributes
): Promise<EvidenceContext> {
	const group = await database.models.Group.findByPk(claim.groupId);
	// One author list for the PDF and the DOI's creators.
	const authors = (await authorsOf(database, claim)).map((a) => a.name);
	return {
		group: (group?.get('name') as string | undefined) ?? 'no group',
		authors,
		sourceDescription: claim.sourceDescription,
		countsFileName: dataset.originalName,
		// From the upload's summary, so issuing parses nothing on the request thread.
		coincidencesPerBasis: Object.entries(dataset.summary.totals).map(([basis, total]) => ({
			basis: Number(basis),
			total
		}))
	};
}
