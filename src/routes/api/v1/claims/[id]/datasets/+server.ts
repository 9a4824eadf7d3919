import { json } from '@sveltejs/kit';
import { InputError } from '$lib/certify';
import { ApiError, apiEndpoint, readCountsUpload } from '$lib/server/api';
import { addDataset, listDatasets } from '$lib/server/services/datasets';

export const GET = apiEndpoint(async ({ event, user, database }) => {
	return json(await listDatasets(database, user.id, event.params.id!));
});

/** A counts file as multipart field `counts`, or as a raw text/csv or application/json body. */
export const POST = apiEndpoint(async ({ event, user, database }) => {
	const upload = await readCountsUpload(event.request, event.url);
	try {
		const dataset = await addDataset(database, user.id, event.params.id!, upload);
		return json(dataset, { status: 201 });
	} catch (error) {
		if (!(error instanceof InputError)) throw error;
		throw new ApiError(400, 'bad_counts', error.message, {
			line: error.line ?? null,
			column: error.column ?? null
		});
	}
});
