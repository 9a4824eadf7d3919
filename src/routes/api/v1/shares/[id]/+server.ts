import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { withdrawShare } from '$lib/server/review/shares';
import type { RequestHandler } from './$types';

/** Withdraws a share; its review links stop working at once. */
export const DELETE: RequestHandler = apiEndpoint(async ({ event, database, actor }) =>
	json(await withdrawShare(database, actor, event.params.id!))
);
