import { json } from '@sveltejs/kit';
import { reviewEndpoint } from '$lib/server/http/review-api';
import { refereeView } from '$lib/server/review/referee';
import type { RequestHandler } from './$types';

/** The claim, its certificate, the certified check, the data summary and tables, own re-runs and report. */
export const GET: RequestHandler = reviewEndpoint(async ({ database, actor }) =>
	json(await refereeView(database, actor))
);
