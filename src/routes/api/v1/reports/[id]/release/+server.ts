import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { releaseReport } from '$lib/server/review/reports';
import type { RequestHandler } from './$types';

/** The editor releases a filed report to the claim's authors. */
export const POST: RequestHandler = apiEndpoint(async ({ event, database, actor }) =>
	json(await releaseReport(database, actor, event.params.id!))
);
