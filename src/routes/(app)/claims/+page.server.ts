import { claimQuerySchema, DEFAULT_SORT, firstOrder } from '$lib/claims/filter';
import { pagingSchema } from '$lib/paging';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { listClaims } from '$lib/server/claims/claims';
import type { ListQuery } from './query';
import type { PageServerLoad } from './$types';

/** The first page as the server sees it, so the list shows without JavaScript too. */
export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const paging = pagingSchema(100).safeParse(Object.fromEntries(url.searchParams));
	if (!paging.success) pageProblem(paging.error);
	const parsed = claimQuerySchema.safeParse(Object.fromEntries(url.searchParams));
	const asked = parsed.success ? parsed.data : {};
	const sort = asked.sort ?? DEFAULT_SORT;
	const query: ListQuery = {
		...asked,
		sort,
		order: asked.order ?? firstOrder(sort),
		page: asked.page ?? 1
	};
	const { database } = await app();
	return { query, listing: await listClaims(database, actor, query) };
};
