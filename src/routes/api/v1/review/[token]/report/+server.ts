import { json } from '@sveltejs/kit';
import { readJson } from '$lib/server/http/read-body';
import { reviewEndpoint } from '$lib/server/http/review-api';
import { ownReport, reportJsonSchema, saveReport } from '$lib/server/review/reports';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = reviewEndpoint(async ({ database, actor }) =>
	json({ report: await ownReport(database, actor) })
);

/** Saves the report; `submit: false` keeps a draft, anything else files it (then it is fixed). */
export const POST: RequestHandler = reviewEndpoint(async ({ event, database, actor }) => {
	const input = await readJson(event.request, reportJsonSchema);
	const report = await saveReport(database, actor, input);
	return json(report, { status: report.state === 'draft' ? 200 : 201 });
});
