import { json } from '@sveltejs/kit';
import { apiProblem } from '$lib/server/http/problems';
import { planFor } from '$lib/server/checks/plans';
import { z } from 'zod';
import { app } from '$lib/server/app/app';
import { planFromCheck } from '$lib/server/checks/check-plan';
import { problemResponse } from '$lib/server/http/problems';
import type { RequestHandler } from './$types';

const fromCheck = z.object({
	checkId: z.string().min(1),
	schmidtNumber: z.coerce.number().int().optional()
});

/**
 * Public: what it takes to certify Schmidt number k (critical visibilities, simulated counts).
 * With `checkId`, a finished check is the model: only for callers who may read that check.
 */
export const GET: RequestHandler = async ({ url, getClientAddress, locals }) => {
	try {
		if (!url.searchParams.has('checkId'))
			return json(await planFor(Object.fromEntries(url.searchParams), getClientAddress()));
		if (locals.actor.kind === 'anonymous')
			return problemResponse({
				status: 401,
				code: 'unauthorised',
				message:
					'A check as the model needs a caller who may read it: sign in or send an API token.'
			});
		const q = fromCheck.parse(Object.fromEntries(url.searchParams));
		const { database } = await app();
		return json(
			await planFromCheck(database, locals.actor, q.checkId, q.schmidtNumber, getClientAddress())
		);
	} catch (error) {
		return apiProblem(error);
	}
};
