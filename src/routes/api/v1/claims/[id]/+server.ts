import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/api';
import { getClaim } from '$lib/server/services/claims';
import { NotFoundError } from '$lib/server/services/errors';

export const GET = apiEndpoint(async ({ event, user, database }) => {
	const claim = await getClaim(database, user.id, event.params.id!);
	if (!claim) throw new NotFoundError('No such claim.');
	return json(claim);
});
