import { reviewEndpoint } from '$lib/server/http/review-api';
import { refereeBundle } from '$lib/server/review/referee';
import type { RequestHandler } from './$types';

/** The current certificate's evidence bundle. */
export const GET: RequestHandler = reviewEndpoint(async ({ database, actor }) => {
	const { bytes, filename, contentType } = await refereeBundle(database, actor);
	return new Response(new Uint8Array(bytes), {
		headers: {
			'content-type': contentType,
			'content-disposition': `attachment; filename="${filename}"`
		}
	});
});
