import { apiEndpoint } from '$lib/server/http/api';
import { certificateDownload } from '$lib/server/certificates/certificate-download';

export const GET = apiEndpoint(async ({ event, actor, database }) =>
	certificateDownload(database, actor, event.params.id!, 'bundle')
);
