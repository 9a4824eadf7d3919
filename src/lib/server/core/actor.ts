/**
 * Who is asking: the hooks resolve one Actor per request into locals.actor, and every service
 * takes it. permissions.ts decides what each kind of actor may see and do.
 */
import type { Database } from '../db';
import type { AccountRole } from '../db/models/User';

/** What an API token may touch: its owner's claims, datasets and checks; never accounts or tokens. */
export type TokenScope = 'claims';

export interface AnonymousActor {
	kind: 'anonymous';
}

/** A person signed in with a session cookie; group memberships are looked up when a rule needs them. */
export interface UserActor {
	kind: 'user';
	userId: string;
	accountRole: AccountRole;
	emailVerified: boolean;
}

/** A script holding an API token: acts as its owner within the token's scope. */
export interface TokenActor {
	kind: 'token';
	userId: string;
	accountRole: AccountRole;
	emailVerified: boolean;
	tokenId: string;
	scope: TokenScope;
}

/** A referee holding a review link (issue 9 adds the resolver): one claim, no account. */
export interface RefereeActor {
	kind: 'referee';
	claimId: string;
	linkId: string;
}

export type Actor = AnonymousActor | UserActor | TokenActor | RefereeActor;

/** An actor backed by an account: a signed-in user or one of their tokens. */
export type AccountActor = UserActor | TokenActor;

export const ANONYMOUS: AnonymousActor = Object.freeze({ kind: 'anonymous' });

export const isAccount = (actor: Actor): actor is AccountActor =>
	actor.kind === 'user' || actor.kind === 'token';

/** The account behind the actor, for audit rows and "created by" columns; null for others. */
export const accountIdOf = (actor: Actor): string | null =>
	isAccount(actor) ? actor.userId : null;

/** The signed-in actor for a user as the database has them now; null for an unknown id. */
export async function userActor(database: Database, userId: string): Promise<UserActor | null> {
	const user = (await database.models.User.findByPk(userId))?.get({ plain: true });
	if (!user) return null;
	return {
		kind: 'user',
		userId: user.id,
		accountRole: user.accountRole,
		emailVerified: user.emailVerifiedAt !== null
	};
}
