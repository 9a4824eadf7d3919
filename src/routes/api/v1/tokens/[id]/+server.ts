import { apiEndpoint } from '$lib/server/http/api';
import { revokeToken } from '$lib/server/accounts/tokens';

/** Revokes one of the signed-in caller's tokens (again: no-op). */
export const DELETE = apiEndpoint(async ({ event, actor, database }) => {
	await revokeToken(database, actor, event.params.id!);
	return new Response(null, { status: 204 });
});
