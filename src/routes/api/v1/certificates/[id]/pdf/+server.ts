import { apiEndpoint } from '$lib/server/api';
import { certificateDownload } from '$lib/server/certificate-download';

export const GET = apiEndpoint(async ({ event, actor, database }) =>
	certificateDownload(database, actor, event.params.id!, 'pdf')
);
