import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { createToken, listTokens, tokenJsonSchema } from '$lib/server/accounts/tokens';

/** The signed-in caller's tokens (a session, not a token: tokens do not manage tokens). */
export const GET = apiEndpoint(async ({ actor, database }) => {
	return json(await listTokens(database, actor));
});

/** Issues a token: `{ name, expiresInDays? }`, 1–365 days or "never", 90 by default. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const input = await readJson(event.request, tokenJsonSchema);
	return json(await createToken(database, actor, input), { status: 201 });
});
