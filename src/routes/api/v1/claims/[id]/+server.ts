import { json } from '@sveltejs/kit';
import { claimJsonSchema } from '$lib/claims/schema';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { updateClaim } from '$lib/server/claims/claim-edit';
import { getClaim } from '$lib/server/claims/claims';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await getClaim(database, actor, event.params.id!));
});

/** Replaces the claim's fields before its first check (409 after one). */
export const PUT = apiEndpoint(async ({ event, actor, database }) => {
	const input = await readJson(event.request, claimJsonSchema);
	return json(await updateClaim(database, actor, event.params.id!, input));
});
