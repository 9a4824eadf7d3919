import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/api';
import { getClaim } from '$lib/server/services/claims';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await getClaim(database, actor, event.params.id!));
});
