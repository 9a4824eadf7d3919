/**
 * Who is acting in the current request, kept for the audit trail: the hooks run each request
 * inside `runAs`, and an audit row then says whether a session, an API token or a review link acted.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import type { Actor } from './actor';

const acting = new AsyncLocalStorage<Actor>();

export const runAs = <T>(actor: Actor, work: () => T): T => acting.run(actor, work);

/** Background work (the check runner) started during a request acts for nobody in particular. */
export const outsideRequest = <T>(work: () => T): T => acting.exit(work);

/** How the current request's caller acted, for details.actedAs; null outside a request. */
export function actedAs(): Record<string, string> | null {
	const actor = acting.getStore();
	if (!actor) return null;
	if (actor.kind === 'token') return { by: 'api-token', tokenId: actor.tokenId };
	if (actor.kind === 'referee') return { by: 'review-link', reviewLinkId: actor.linkId };
	if (actor.kind === 'user') return { by: 'session' };
	return { by: 'anonymous' };
}
