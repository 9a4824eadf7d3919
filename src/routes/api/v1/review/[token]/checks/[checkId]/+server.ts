import { json } from '@sveltejs/kit';
import { reviewEndpoint } from '$lib/server/http/review-api';
import { cancelRefereeCheck, refereeCheck } from '$lib/server/review/referee';
import type { RequestHandler } from './$types';

/** A re-run started through this link: the shape of any check, plus how it compares. */
export const GET: RequestHandler = reviewEndpoint(async ({ event, database, actor }) =>
	json(await refereeCheck(database, actor, event.params.checkId!))
);

/** Cancels a queued or running re-run of this link; 409 once it has ended. */
export const DELETE: RequestHandler = reviewEndpoint(async ({ event, database, actor }) =>
	json(await cancelRefereeCheck(database, actor, event.params.checkId!))
);
