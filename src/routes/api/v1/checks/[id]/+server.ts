import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/api';
import { getCheck } from '$lib/server/services/checks';
import { NotFoundError } from '$lib/server/services/errors';

export const GET = apiEndpoint(async ({ event, user, database }) => {
	const check = await getCheck(database, user.id, event.params.id!);
	if (!check) throw new NotFoundError('No such check.');
	return json(check);
});
