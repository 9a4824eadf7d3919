/**
 * Service rules: actions on the service itself or on the actor's own account (groups to start or
 * join, tokens, accounts, the outbox, the archive), invitations and tokens. Callers import
 * through permissions.ts.
 */
import type { Database } from '../db';
import { ForbiddenError } from '../core/errors';
import { isAccount, type AccountActor, type Actor } from '../core/actor';
import { maskedAddress } from './masked-address';
import { groupIdsOf, type Decision } from './standing';

/** Actions on the service itself or on the actor's own account, not on one claim or group. */
export type ServiceAction =
	| 'create-group'
	| 'join-group'
	| 'own-account'
	| 'issue-token'
	| 'manage-tokens'
	| 'manage-accounts'
	| 'read-outbox'
	| 'read-doi-outbox'
	| 'retry-doi'
	| 'read-service-health'
	| 'read-archive';

const SERVICE_DENIALS: Record<ServiceAction, string> = {
	'create-group': 'Sign in to start a group.',
	'join-group': 'Sign in to join a group.',
	'own-account': 'Sign in to change your account.',
	'issue-token': 'Only editors and members of a group issue API tokens.',
	'manage-tokens': 'Sign in to see or revoke your API tokens.',
	'manage-accounts': 'Only admins may do this.',
	'read-outbox': 'Only admins may do this.',
	'read-doi-outbox': 'Only admins may see the DOI registrations.',
	'retry-doi': 'Only admins may send a DOI registration again.',
	'read-service-health': 'Only admins may do this.',
	'read-archive':
		'You belong to no group, so there is no group archive to list. Start a group or accept an invitation to one first.'
};

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
	const adminOnly: ServiceAction[] = [
		'manage-accounts',
		'read-outbox',
		'read-service-health',
		'read-doi-outbox',
		'retry-doi'
	];
	if (adminOnly.includes(action)) {
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

/** Whether this account is the one the invitation was sent to. */
export function isInvitee(
	account: { email: string } | null,
	invitation: { email: string }
): boolean {
	return account?.email === invitation.email;
}

/**
 * The invited address as this viewer may see it: whole to the invitee and to someone not signed
 * in (the link stands for the mailbox), masked to anyone signed in with another address.
 */
export function invitedAddressFor(
	account: { email: string } | null,
	invitation: { email: string }
): string {
	return account && !isInvitee(account, invitation)
		? maskedAddress(invitation.email)
		: invitation.email;
}

/**
 * An invitation is used only by the account with the invited address; anyone else holding the
 * link is told which address to sign in with, masked, as the link may have been passed on.
 */
export function requireInvitee(account: { email: string }, invitation: { email: string }): void {
	if (isInvitee(account, invitation)) return;
	throw new ForbiddenError(
		`This invitation was sent to another address; sign in as ${maskedAddress(invitation.email)} to accept it.`
	);
}

/** A token is seen only by its owner, signed in; anyone else is told it does not exist. */
export function decideToken(actor: Actor, token: { userId: string }): Decision {
	if (actor.kind !== 'user') return actor.kind === 'token' ? 'denied' : 'hidden';
	return token.userId === actor.userId ? 'allowed' : 'hidden';
}
