import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/api';
import { getCertificate } from '$lib/server/services/certificate-reads';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await getCertificate(database, actor, event.params.id!));
});
