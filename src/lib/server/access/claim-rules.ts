/**
 * Claim rules: what each kind of viewer may do to a claim once it is visible to them, what a
 * withdrawn claim no longer takes, and the filter that lists the visible ones. Callers import
 * through permissions.ts.
 */
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import { ConflictError, ForbiddenError, NotFoundError } from '../core/errors';
import type { Actor } from '../core/actor';
import { groupIdsOf, roleIn, sharedClaimIds, sharedWith, type Decision } from './standing';

export type ClaimAction =
	| 'read'
	| 'read-datasets'
	| 'add-dataset'
	| 'remove-dataset'
	| 'edit-claim'
	| 'withdraw-claim'
	| 'start-check'
	| 'cancel-check'
	| 'issue-certificate'
	| 'read-analyses'
	| 'file-report'
	| 'share'
	| 'review';

/** What each kind of claim viewer may do once the claim is visible to them. */
const CLAIM_RULES = {
	member: [
		'read',
		'read-datasets',
		'add-dataset',
		'remove-dataset',
		'edit-claim',
		'withdraw-claim',
		'start-check',
		'cancel-check',
		'issue-certificate',
		// Every analysis the group ran on a counts file, across its claims (issue 15).
		'read-analyses',
		'share'
	],
	editor: ['read', 'read-datasets', 'review'],
	// The counts are in the evidence bundle the referee downloads anyway.
	referee: ['read', 'read-datasets', 'start-check', 'cancel-check', 'file-report']
} satisfies Record<string, ClaimAction[]>;

/** What a withdrawn claim no longer takes: it stays readable, shareable and reviewable as it was. */
const CLOSED_BY_WITHDRAWAL: readonly ClaimAction[] = [
	'add-dataset',
	'remove-dataset',
	'edit-claim',
	'start-check',
	'issue-certificate'
];

const CLAIM_DENIALS: Record<ClaimAction, string> = {
	read: 'You may not see this claim.',
	'read-datasets': 'You may not see this claim’s counts files.',
	'add-dataset': 'Only members of the claim’s group upload counts.',
	'remove-dataset': 'Only members of the claim’s group take back counts files.',
	'edit-claim': 'Only the claim’s author or a group lead may edit it.',
	'withdraw-claim': 'Only a lead of the group or the claim’s author may withdraw it.',
	'start-check': 'Only members of the claim’s group start checks.',
	'cancel-check': 'Only those who may start a check on this claim cancel one.',
	'issue-certificate': 'Only members of the claim’s group issue certificates.',
	'read-analyses': 'Only members of the claim’s group see every analysis of its counts.',
	'file-report': 'Only the referee holding a review link files a report.',
	share: 'Only members of the claim’s group share it or read its shares.',
	review: 'Only the editor the claim is shared with makes review links and releases reports.'
};

export async function decideClaim(
	database: Database,
	actor: Actor,
	claim: Pick<ClaimAttributes, 'id' | 'groupId' | 'createdBy'>,
	action: ClaimAction,
	transaction?: Transaction
): Promise<Decision> {
	const allows = (rules: ClaimAction[]): Decision =>
		rules.includes(action) ? 'allowed' : 'denied';
	if (actor.kind === 'anonymous') return 'hidden';
	if (actor.kind === 'referee')
		return actor.claimId === claim.id ? allows(CLAIM_RULES.referee) : 'hidden';
	const role = await roleIn(database, actor, claim.groupId, transaction);
	if (role) {
		// A claim is corrected or withdrawn by whoever wrote it, or by a lead of its group.
		const authorOrLead = claim.createdBy === actor.userId || role === 'lead';
		const authorsAction = action === 'edit-claim' || action === 'withdraw-claim';
		return authorsAction && !authorOrLead ? 'denied' : allows(CLAIM_RULES.member);
	}
	if (actor.accountRole === 'editor' && (await sharedWith(database, actor, claim.id, transaction)))
		return allows(CLAIM_RULES.editor);
	return 'hidden';
}

/** The claim's row when the actor may do `action` to it; NotFoundError / ForbiddenError otherwise. */
export async function requireClaim(
	database: Database,
	actor: Actor,
	claimId: string,
	action: ClaimAction,
	transaction?: Transaction
): Promise<ClaimAttributes> {
	const row = await database.models.Claim.findByPk(claimId, { transaction });
	const claim = row?.get({ plain: true }) as ClaimAttributes | undefined;
	const decision = claim
		? await decideClaim(database, actor, claim, action, transaction)
		: 'hidden';
	if (decision === 'hidden') throw new NotFoundError('No such claim.');
	if (decision === 'denied') throw new ForbiddenError(CLAIM_DENIALS[action]);
	requireOpen(claim!, action);
	return claim!;
}

/** ConflictError when a withdrawn claim is asked for new counts, corrections, checks or certificates. */
export function requireOpen(
	claim: Pick<ClaimAttributes, 'state' | 'withdrawnReason'>,
	action: ClaimAction
): void {
	if (claim.state !== 'withdrawn' || !CLOSED_BY_WITHDRAWAL.includes(action)) return;
	const why = claim.withdrawnReason ? ` (“${claim.withdrawnReason}”)` : '';
	throw new ConflictError(
		`This claim was withdrawn${why}; it takes no new counts, corrections, checks or certificates.`
	);
}

/**
 * A check is cancelled by whoever may start one on its claim, within their own bucket: members
 * cancel the group's checks, a referee only the re-runs of their own link.
 */
export async function requireCheckCancel(
	database: Database,
	actor: Actor,
	check: { claimId: string; reviewLinkId?: string | null }
): Promise<ClaimAttributes> {
	const claim = await requireClaim(database, actor, check.claimId, 'cancel-check');
	const link = check.reviewLinkId ?? null;
	// A referee sees no other check of the claim; members see review re-runs but leave them be.
	if (actor.kind === 'referee' && link !== actor.linkId) throw new NotFoundError('No such check.');
	if (actor.kind !== 'referee' && link !== null)
		throw new ForbiddenError('A referee’s re-run is cancelled only through its own review link.');
	return claim;
}

/** A certificate is withdrawn by its group's lead or by whoever issued it, signed in in person. */
export async function requireWithdrawal(
	database: Database,
	actor: Actor,
	certificate: { claimId: string; issuedBy: string | null }
): Promise<ClaimAttributes> {
	const claim = await requireClaim(database, actor, certificate.claimId, 'read');
	const issuer = actor.kind === 'user' && certificate.issuedBy === actor.userId;
	const lead = actor.kind === 'user' && (await roleIn(database, actor, claim.groupId)) === 'lead';
	if (!issuer && !lead)
		throw new ForbiddenError('Only the group lead or the issuer may withdraw a certificate.');
	return claim;
}

/** A filter on claims that keeps exactly those the actor may read (for lists and counts). */
export async function visibleClaimsWhere(database: Database, actor: Actor): Promise<WhereOptions> {
	if (actor.kind === 'anonymous') return { id: { [Op.in]: [] } };
	if (actor.kind === 'referee') return { id: actor.claimId };
	const groupIds = await groupIdsOf(database, actor);
	const shared = actor.accountRole === 'editor' ? await sharedClaimIds(database, actor) : [];
	return {
		[Op.or]: [{ groupId: { [Op.in]: groupIds } }, { id: { [Op.in]: shared } }]
	};
}
