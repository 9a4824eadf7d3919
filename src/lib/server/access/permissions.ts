/**
 * Every permission in one place: may this actor see or do this to a claim, a group, a token, the
 * accounts or the outbox. A decision is 'hidden' (answer 404, so ids do not leak), 'denied'
 * (visible, but not for this actor: 403) or 'allowed'. Services call the require* functions.
 */
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { GroupRole } from '../db/models/Membership';
import { ConflictError, ForbiddenError, NotFoundError } from '../services/errors';
import { isAccount, type AccountActor, type Actor } from './actor';
import { maskedAddress } from './masked-address';

export type Decision = 'allowed' | 'denied' | 'hidden';

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
	| 'file-report'
	| 'share'
	| 'review';
export type GroupAction = 'read' | 'create-claim' | 'manage';
/** Actions on the service itself or on the actor's own account, not on one claim or group. */
export type ServiceAction =
	| 'create-group'
	| 'join-group'
	| 'own-account'
	| 'issue-token'
	| 'manage-tokens'
	| 'manage-accounts'
	| 'read-outbox'
	| 'read-archive';

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
	'file-report': 'Only the referee holding a review link files a report.',
	share: 'Only members of the claim’s group share it or read its shares.',
	review: 'Only the editor the claim is shared with makes review links and releases reports.'
};

const SERVICE_DENIALS: Record<ServiceAction, string> = {
	'create-group': 'Sign in to start a group.',
	'join-group': 'Sign in to join a group.',
	'own-account': 'Sign in to change your account.',
	'issue-token': 'Only editors and members of a group issue API tokens.',
	'manage-tokens': 'Sign in to see or revoke your API tokens.',
	'manage-accounts': 'Only admins may do this.',
	'read-outbox': 'Only admins may do this.',
	'read-archive':
		'You belong to no group, so there is no group archive to list. Start a group or accept an invitation to one first.'
};

/** The actor's role in the group, from the database as it is now (or in the transaction). */
export async function roleIn(
	database: Database,
	actor: AccountActor,
	groupId: string,
	transaction?: Transaction
): Promise<GroupRole | null> {
	const row = await database.models.Membership.findOne({
		where: { userId: actor.userId, groupId },
		transaction
	});
	return (row?.get('role') as GroupRole | undefined) ?? null;
}

async function groupIdsOf(database: Database, actor: AccountActor): Promise<string[]> {
	const rows = await database.models.Membership.findAll({ where: { userId: actor.userId } });
	return rows.map((r) => r.get('groupId') as string);
}

/** Whether the editor holds an open (not withdrawn) share of this claim. */
export async function sharedWith(
	database: Database,
	actor: AccountActor,
	claimId: string,
	transaction?: Transaction
): Promise<boolean> {
	const where = { claimId, editorId: actor.userId, withdrawnAt: null };
	return (await database.models.Share.count({ where, transaction })) > 0;
}

/** Ids of the claims shared with an editor (for lists); the same rule as sharedWith. */
export async function sharedClaimIds(database: Database, actor: AccountActor): Promise<string[]> {
	const rows = await database.models.Share.findAll({
		where: { editorId: actor.userId, withdrawnAt: null },
		attributes: ['claimId']
	});
	return rows.map((r) => r.get('claimId') as string);
}

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

export async function decideGroup(
	database: Database,
	actor: Actor,
	groupId: string,
	action: GroupAction,
	transaction?: Transaction
): Promise<{ decision: Decision; role: GroupRole | null }> {
	if (actor.kind === 'anonymous' || actor.kind === 'referee')
		return { decision: 'hidden', role: null };
	const role = await roleIn(database, actor, groupId, transaction);
	if (!role) return { decision: 'hidden', role };
	const mayManage = actor.kind === 'user' && role === 'lead';
	return { decision: action !== 'manage' || mayManage ? 'allowed' : 'denied', role };
}

/** The actor's role in the group when they may do `action`; NotFoundError / ForbiddenError otherwise. */
export async function requireGroup(
	database: Database,
	actor: Actor,
	groupId: string,
	action: GroupAction,
	transaction?: Transaction
): Promise<GroupRole> {
	const { decision, role } = await decideGroup(database, actor, groupId, action, transaction);
	if (decision === 'hidden') throw new NotFoundError('No such group.');
	if (decision === 'denied')
		throw new ForbiddenError(
			actor.kind === 'token'
				? 'An API token cannot manage a group.'
				: 'Only a group lead may do this.'
		);
	return role!;
}

export async function decideService(
	database: Database,
	actor: Actor,
	action: ServiceAction
): Promise<Decision> {
	// A group's archive is its claims: a token reads it as its owner would.
	if (action === 'read-archive')
		return isAccount(actor) && (await groupIdsOf(database, actor)).length > 0
			? 'allowed'
			: 'denied';
	// Tokens act on claims only; accounts, groups and tokens need a person signed in.
	if (actor.kind !== 'user') return 'denied';
	if (action === 'manage-accounts' || action === 'read-outbox') {
		// Re-read: an admin demoted a moment ago must not keep admin powers for the session.
		const user = await database.models.User.findByPk(actor.userId);
		return user?.get('accountRole') === 'admin' ? 'allowed' : 'denied';
	}
	if (action === 'issue-token')
		return actor.accountRole === 'editor' || (await groupIdsOf(database, actor)).length > 0
			? 'allowed'
			: 'denied';
	return 'allowed';
}

/** The signed-in user when they may do `action`; ForbiddenError otherwise. */
export async function requireService(
	database: Database,
	actor: Actor,
	action: ServiceAction
): Promise<AccountActor> {
	if ((await decideService(database, actor, action)) !== 'allowed')
		throw new ForbiddenError(SERVICE_DENIALS[action]);
	return actor as AccountActor;
}

/**
 * An invitation is used only by the account with the invited address; anyone else holding the
 * link is told which address to sign in with, masked, as the link may have been passed on.
 */
export function requireInvitee(account: { email: string }, invitation: { email: string }): void {
	if (account.email === invitation.email) return;
	throw new ForbiddenError(
		`This invitation was sent to another address; sign in as ${maskedAddress(invitation.email)} to accept it.`
	);
}

/** A token is seen only by its owner, signed in; anyone else is told it does not exist. */
export function decideToken(actor: Actor, token: { userId: string }): Decision {
	if (actor.kind !== 'user') return actor.kind === 'token' ? 'denied' : 'hidden';
	return token.userId === actor.userId ? 'allowed' : 'hidden';
}
