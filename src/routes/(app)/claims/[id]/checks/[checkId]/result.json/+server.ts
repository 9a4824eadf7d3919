import { json } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { pageProblem } from '$lib/server/http/problems';
import { checkResult } from '$lib/server/checks/check-exports';
import type { RequestHandler } from './$types';

/** The finished check's result as JSON, the same numbers `certify --json` prints. */
export const GET: RequestHandler = async ({ locals, params }) => {
	const { database } = await app();
	const result = await checkResult(database, locals.actor, params.id, params.checkId).catch(
		pageProblem
	);
	const disposition = `attachment; filename="rankseal-check-${params.checkId}.json"`;
	return json(result, { headers: { 'content-disposition': disposition } });
};
