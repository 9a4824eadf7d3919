import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { revokeReviewLink } from '$lib/server/review/review-links';
import type { RequestHandler } from './$types';

/** Revokes a review link at once. */
export const DELETE: RequestHandler = apiEndpoint(async ({ event, database, actor }) =>
	json(await revokeReviewLink(database, actor, event.params.id!))
);
