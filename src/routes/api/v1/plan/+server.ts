import { json } from '@sveltejs/kit';
import { apiProblem } from '$lib/server/http/problems';
import { planFor } from '$lib/server/checks/plans';
import type { RequestHandler } from './$types';

/** Public: what it takes to certify Schmidt number k (critical visibilities, simulated counts). */
export const GET: RequestHandler = async ({ url, getClientAddress }) => {
	try {
		return json(await planFor(Object.fromEntries(url.searchParams), getClientAddress()));
	} catch (error) {
		return apiProblem(error);
	}
};
