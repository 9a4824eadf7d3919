import { apiEndpoint } from '$lib/server/http/api';
import { removeDataset } from '$lib/server/datasets/dataset-removal';

/** Takes back an upload no check has used yet (409 once a check has used it). */
export const DELETE = apiEndpoint(async ({ event, actor, database }) => {
	await removeDataset(database, actor, event.params.id!, event.params.datasetId!);
	return new Response(null, { status: 204 });
});
