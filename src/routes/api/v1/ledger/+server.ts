import { json } from '@sveltejs/kit';
import { pagingSchema } from '$lib/paging';
import { app } from '$lib/server/app/app';
import { apiProblem } from '$lib/server/http/problems';
import { LEDGER_PAGE_SIZE } from '$lib/server/ledger/ledger';
import { publicLedgerPage } from '$lib/server/ledger/ledger-roles';
import type { RequestHandler } from './$types';

const pageQuery = pagingSchema(200);

/** Public: one page of the ledger, oldest first (ids, hashes, signatures, roles; no accounts). */
export const GET: RequestHandler = async ({ url }) => {
	const parsed = pageQuery.safeParse(Object.fromEntries(url.searchParams));
	if (!parsed.success) return apiProblem(parsed.error);
	const { database } = await app();
	return json(
		await publicLedgerPage(
			database,
			parsed.data.page ?? 1,
			parsed.data.pageSize ?? LEDGER_PAGE_SIZE
		)
	);
};
