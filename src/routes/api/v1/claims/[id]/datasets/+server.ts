import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { readCountsUpload } from '$lib/server/http/multipart';
import { addCountsFiles } from '$lib/server/datasets/counts-files';
import { listDatasets } from '$lib/server/datasets/datasets';
import { withUploadSlot } from '$lib/server/datasets/upload-slots';

export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await listDatasets(database, actor, event.params.id!));
});

/** Counts files as multipart parts `counts` (with `basis`), or one as a raw text/csv or JSON body. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const claimId = event.params.id!;
	// The slot is taken before the body is read: a refused upload costs no memory.
	const dataset = await withUploadSlot(database, actor, claimId, async () => {
		const upload = await readCountsUpload(event.request, event.url);
		return addCountsFiles(database, actor, claimId, upload);
	});
	return json(dataset, { status: 201 });
});
