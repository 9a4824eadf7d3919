import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { getCertificate } from '$lib/server/certificates/certificate-reads';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await getCertificate(database, actor, event.params.id!));
});
