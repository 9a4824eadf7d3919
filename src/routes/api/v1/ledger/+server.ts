import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { app } from '$lib/server/app';
import { apiProblem } from '$lib/server/problems';
import { LEDGER_PAGE_SIZE, listLedger } from '$lib/server/services/ledger';
import type { RequestHandler } from './$types';

const pageQuery = z.object({
	page: z.coerce.number().int().min(1).default(1),
	pageSize: z.coerce.number().int().min(1).max(200).default(LEDGER_PAGE_SIZE)
});

/** Public: one page of the ledger, oldest first (ids, hashes and signatures, nothing private). */
export const GET: RequestHandler = async ({ url }) => {
	const parsed = pageQuery.safeParse(Object.fromEntries(url.searchParams));
	if (!parsed.success) return apiProblem(parsed.error);
	const { database } = await app();
	return json(await listLedger(database, parsed.data.page, parsed.data.pageSize));
};
