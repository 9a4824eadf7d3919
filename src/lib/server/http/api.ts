/**
 * The endpoint wrapper of the JSON API (routes/api/v1): the caller requirement (a session cookie
 * or a bearer token, both resolved into locals.actor), errors answered through problems.ts as
 * everywhere. Bounded body reading is read-body.ts; counts uploads are multipart.ts.
 */
import type { RequestEvent, RequestHandler } from '@sveltejs/kit';
import type { Actor } from '../core/actor';
import { app } from '../app/app';
import type { Database } from '../db';
import { apiProblem, problemResponse } from './problems';

export { ApiError, describeIssues } from './problems';

interface Context {
	event: RequestEvent;
	actor: Actor;
	database: Database;
}

/** An endpoint for identified callers: 401 for anonymous ones, service errors as JSON. */
export function apiEndpoint(handler: (context: Context) => Promise<Response>): RequestHandler {
	return async (event) => {
		const actor = event.locals.actor;
		if (actor.kind === 'anonymous') {
			return problemResponse({
				status: 401,
				code: 'unauthorised',
				message: 'Sign in, or send an API token as "Authorization: Bearer rks_…".'
			});
		}
		try {
			return await handler({ event, actor, database: (await app()).database });
		} catch (error) {
			return apiProblem(error);
		}
	};
}
