import { json } from '@sveltejs/kit';
import { checkRequestJsonSchema } from '$lib/claims/schema';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { startCheck } from '$lib/server/checks/checks';

/** Queues a check; poll GET /api/v1/checks/{id} for progress and the result. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const request = await readJson(event.request, checkRequestJsonSchema);
	const check = await startCheck(database, actor, event.params.id!, request);
	return json(check, { status: 202, headers: { location: `/api/v1/checks/${check.id}` } });
});
