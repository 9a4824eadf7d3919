import { json } from '@sveltejs/kit';
import { apiEndpoint, readCountsUpload } from '$lib/server/api';
import { addDataset, listDatasets } from '$lib/server/services/datasets';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await listDatasets(database, actor, event.params.id!));
});

/** A counts file as multipart field `counts`, or as a raw text/csv or application/json body. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const upload = await readCountsUpload(event.request, event.url);
	const dataset = await addDataset(database, actor, event.params.id!, upload);
	return json(dataset, { status: 201 });
});
