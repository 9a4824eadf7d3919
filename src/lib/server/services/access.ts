/**
 * Who may see what: a claim, its datasets and checks are visible to members of the claim's
 * group only. Callers answer 404 (never 403) for anything not visible, so ids do not leak.
 */
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { GroupRole } from '../db/models/Membership';

export async function membershipsOf(
	database: Database,
	userId: string
): Promise<Map<string, GroupRole>> {
	const rows = await database.models.Membership.findAll({ where: { userId } });
	return new Map(rows.map((r) => [r.get('groupId') as string, r.get('role') as GroupRole]));
}

/** The claim when the user is a member of its group, else null. */
export async function visibleClaim(
	database: Database,
	userId: string,
	claimId: string
): Promise<ClaimAttributes | null> {
	const claim = await database.models.Claim.findByPk(claimId);
	if (!claim) return null;
	const groups = await membershipsOf(database, userId);
	return groups.has(claim.get('groupId') as string)
		? (claim.get({ plain: true }) as ClaimAttributes)
		: null;
}
