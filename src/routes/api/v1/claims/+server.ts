import { json } from '@sveltejs/kit';
import { claimQuerySchema } from '$lib/claims/filter';
import { claimJsonSchema } from '$lib/claims/schema';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { createClaim, listClaims } from '$lib/server/claims/claims';

/** The claims of the caller's groups: ?q, state, method, sort, order, page, pageSize. */
export const GET = apiEndpoint(async ({ event, actor, database }) => {
	const query = claimQuerySchema.parse(Object.fromEntries(event.url.searchParams));
	return json(await listClaims(database, actor, query));
});

export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const input = await readJson(event.request, claimJsonSchema);
	const claim = await createClaim(database, actor, input);
	return json(claim, { status: 201, headers: { location: `/api/v1/claims/${claim.id}` } });
});
