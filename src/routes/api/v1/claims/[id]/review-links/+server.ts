import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { createReviewLink, reviewLinkJsonSchema } from '$lib/server/review/review-links';
import type { RequestHandler } from './$types';

/** An editor's new review link: `{ label?, expiresInDays? }` → 201 `{ id, url, expiresAt }`. */
export const POST: RequestHandler = apiEndpoint(async ({ event, database, actor }) => {
	const input = await readJson(event.request, reviewLinkJsonSchema);
	return json(await createReviewLink(database, actor, event.params.id!, input), { status: 201 });
});
