/**
 * Every permission in one place: may this actor see or do this to a claim, a group, a token, the
 * accounts or the outbox. A decision is 'hidden' (answer 404, so ids do not leak), 'denied'
 * (visible, but not for this actor: 403) or 'allowed'. Services call the require* functions.
 * This is the one module callers import; the rules sit beside it by concept (claim-rules.ts,
 * group-rules.ts, service-rules.ts, on the lookups of standing.ts) and are re-exported here.
 */
export { roleIn, sharedClaimIds, sharedWith, type Decision } from './standing';
export {
	decideClaim,
	requireCheckCancel,
	requireClaim,
	requireOpen,
	requireWithdrawal,
	visibleClaimsWhere,
	type ClaimAction
} from './claim-rules';
export { claimOffers, type ClaimOffers, type OfferedAction } from './claim-actions';
export { decideGroup, requireGroup, type GroupAction } from './group-rules';
export {
	decideService,
	decideToken,
	invitedAddressFor,
	isInvitee,
	requireInvitee,
	requireService,
	type ServiceAction
} from './service-rules';
