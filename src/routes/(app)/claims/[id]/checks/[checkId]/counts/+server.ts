import { attachment } from '$lib/server/http/attachment';
import { app } from '$lib/server/app/app';
import { pageProblem } from '$lib/server/http/problems';
import { checkCountsFile } from '$lib/server/checks/check-exports';
import type { RequestHandler } from './$types';

/** The counts file the check ran on, exactly as stored; its SHA-256 rides along in a header. */
export const GET: RequestHandler = async ({ locals, params }) => {
	const { database } = await app();
	const file = await checkCountsFile(database, locals.actor, params.id, params.checkId).catch(
		pageProblem
	);
	return new Response(new Uint8Array(file.bytes), {
		headers: {
			'content-type': `${file.contentType}; charset=utf-8`,
			'content-disposition': attachment(file.name),
			'x-content-sha256': file.sha256
		}
	});
};
