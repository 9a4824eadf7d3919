import { z } from 'zod';
import { ARCHIVE_FORMATS, archiveFilterSchema } from '$lib/archive/schema';
import { apiEndpoint } from '$lib/server/http/api';
import { groupArchive } from '$lib/server/claims/archive';
import { archiveCsv, archiveFilename, archiveJson } from '$lib/server/claims/archive-export';

const formatSchema = z.object({
	format: z
		.enum(ARCHIVE_FORMATS, { error: 'Format must be csv or json.' })
		.optional()
		.default('json'),
	download: z.enum(['0', '1']).optional()
});

/** The group archive as JSON (default) or CSV; `download=1` adds a file name for browsers. */
export const GET = apiEndpoint(async ({ event, actor, database }) => {
	const query = Object.fromEntries(event.url.searchParams);
	const { format, download } = formatSchema.parse({
		format: query.format || undefined,
		download: query.download || undefined
	});
	const archive = await groupArchive(database, actor, archiveFilterSchema.parse(query));
	const headers: Record<string, string> = {
		'content-type':
			format === 'csv' ? 'text/csv; charset=utf-8; header=present' : 'application/json'
	};
	if (download === '1')
		headers['content-disposition'] = `attachment; filename="${archiveFilename(archive, format)}"`;
	const body = format === 'csv' ? archiveCsv(archive) : archiveJson(archive);
	return new Response(body, { headers });
});
