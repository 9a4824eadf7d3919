import { json } from '@sveltejs/kit';
import { claimInputSchema } from '$lib/claims/schema';
import { apiEndpoint, readJson } from '$lib/server/api';
import { updateClaim } from '$lib/server/services/claim-edit';
import { getClaim } from '$lib/server/services/claims';
import { NotFoundError } from '$lib/server/services/errors';

export const GET = apiEndpoint(async ({ event, user, database }) => {
	const claim = await getClaim(database, user.id, event.params.id!);
	if (!claim) throw new NotFoundError('No such claim.');
	return json(claim);
});

/** Replaces the claim's fields before its first check (409 after one). */
export const PUT = apiEndpoint(async ({ event, user, database }) => {
	const input = await readJson(event.request, claimInputSchema);
	return json(await updateClaim(database, user.id, event.params.id!, input));
});
