import { json } from '@sveltejs/kit';
import { readJson } from '$lib/server/http/read-body';
import { reviewEndpoint } from '$lib/server/http/review-api';
import { refereeCheckJsonSchema, startRefereeCheck } from '$lib/server/review/referee';
import type { RequestHandler } from './$types';

/** Re-runs the certified check: `{}` for the recorded seed, `{ seed }` for a fresh one. */
export const POST: RequestHandler = reviewEndpoint(async ({ event, database, actor }) => {
	const input = await readJson(event.request, refereeCheckJsonSchema);
	const check = await startRefereeCheck(database, actor, input);
	return json({ id: check.id, status: check.status }, { status: 202 });
});
