/**
 * What a page may offer: every claim action this actor may take on this claim now (allowed by
 * the claim rules and not closed by a withdrawal), so a page shows each role only what it may do.
 */
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { Actor } from '../core/actor';
import { decideClaim, requireOpen, type ClaimAction } from './claim-rules';

const OFFERED = [
	'add-dataset',
	'remove-dataset',
	'edit-claim',
	'withdraw-claim',
	'start-check',
	'issue-certificate',
	'share',
	'review'
] as const satisfies readonly ClaimAction[];

export type OfferedAction = (typeof OFFERED)[number];
export type ClaimOffers = Record<OfferedAction, boolean>;

function open(claim: Pick<ClaimAttributes, 'state' | 'withdrawnReason'>, action: ClaimAction) {
	try {
		requireOpen(claim, action);
		return claim.state !== 'withdrawn' || action !== 'withdraw-claim';
	} catch {
		return false;
	}
}

export async function claimOffers(
	database: Database,
	actor: Actor,
	claim: Pick<ClaimAttributes, 'id' | 'groupId' | 'createdBy' | 'state' | 'withdrawnReason'>
): Promise<ClaimOffers> {
	const entries = await Promise.all(
		OFFERED.map(async (action) => {
			const allowed = (await decideClaim(database, actor, claim, action)) === 'allowed';
			return [action, allowed && open(claim, action)] as const;
		})
	);
	return Object.fromEntries(entries) as ClaimOffers;
}
