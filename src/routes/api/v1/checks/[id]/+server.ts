import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { cancelCheck, getCheck } from '$lib/server/checks/checks';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await getCheck(database, actor, event.params.id!));
});

/** Cancels a queued or running check; 409 once it has ended. */
export const DELETE = apiEndpoint(async ({ event, actor, database }) => {
	return json(await cancelCheck(database, actor, event.params.id!));
});
