import { json } from '@sveltejs/kit';
import { withdrawJsonSchema } from '$lib/claims/api-bodies';
import { withdrawCertificate } from '$lib/server/certificates/certificate-withdraw';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';

/** Withdraws one certificate (its group's lead or its issuer); the claim stays as it is. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const { reason } = await readJson(event.request, withdrawJsonSchema);
	return json(await withdrawCertificate(database, actor, event.params.id!, reason));
});
