/**
 * What the certificate PDF shows beside the signed manifest: the group, its members as the
 * authors (the claim's creator first), the source description and the counts file's name.
 */
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DatasetAttributes } from '../db/models/Dataset';
import type { EvidenceContext } from '../evidence/artifacts';

export async function certificateContext(
	database: Database,
	claim: ClaimAttributes,
	dataset: DatasetAttributes
): Promise<EvidenceContext> {
	const { Group, Membership, User } = database.models;
	const group = await Group.findByPk(claim.groupId);
	const members = await Membership.findAll({ where: { groupId: claim.groupId } });
	const ids = [claim.createdBy, ...members.map((m) => m.get('userId') as string)];
	const users = await User.findAll({ where: { id: [...new Set(ids)] } });
	const nameOf = new Map(users.map((u) => [u.get('id') as string, u.get('name') as string]));
	const authors = [...new Set(ids)].map((id) => nameOf.get(id)).filter((n): n is string => !!n);
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
