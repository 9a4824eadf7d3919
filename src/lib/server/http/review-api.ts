/** JSON endpoints reached by a review link: the referee caller, or one answer that reveals nothing. */
import type { RequestEvent, RequestHandler } from '@sveltejs/kit';
import type { RefereeActor } from '../core/actor';
import { app } from '../app/app';
import type { Database } from '../db';
import { apiProblem, problemResponse } from './problems';

/** Said alike for an unknown, mistyped, expired or revoked link, and for a withdrawn share. */
export const INVALID_REVIEW_LINK =
	'This review link does not work: it may have expired, been revoked or been mistyped. Ask the editor who sent it for a new one.';

interface Context {
	event: RequestEvent;
	actor: RefereeActor;
	database: Database;
}

export function reviewEndpoint(handler: (context: Context) => Promise<Response>): RequestHandler {
	return async (event) => {
		const actor = event.locals.actor;
		if (actor.kind !== 'referee')
			return problemResponse({ status: 404, code: 'not_found', message: INVALID_REVIEW_LINK });
		try {
			return await handler({ event, actor, database: (await app()).database });
		} catch (error) {
			return apiProblem(error);
		}
	};
}
