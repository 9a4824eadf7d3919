import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { listShares, shareClaim, shareInputSchema } from '$lib/server/review/shares';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiEndpoint(async ({ event, database, actor }) =>
	json({ shares: await listShares(database, actor, event.params.id!) })
);

/** Shares a certified claim with an editor: `{ email, journal, manuscript }` → 201. */
export const POST: RequestHandler = apiEndpoint(async ({ event, database, actor }) => {
	const input = await readJson(event.request, shareInputSchema);
	return json(await shareClaim(database, actor, event.params.id!, input), { status: 201 });
});
