import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/api';
import { getCheck } from '$lib/server/services/checks';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await getCheck(database, actor, event.params.id!));
});
