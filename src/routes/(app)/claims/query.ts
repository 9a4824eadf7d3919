/** The claims list's search, filters, sort and page, as they appear in the address and API query. */
import { DEFAULT_SORT, firstOrder, type ClaimQuery, type ClaimSort } from '$lib/claims/filter';

export { DEFAULT_SORT, firstOrder };

export type ListQuery = Required<Pick<ClaimQuery, 'page'>> & Omit<ClaimQuery, 'page'>;
export type SortKey = ClaimSort;

/** Only what differs from the defaults, so addresses stay short; `explicit` spells out sort and order. */
export function searchOf(query: ListQuery, explicit = false): string {
	const params = new URLSearchParams();
	if (query.q) params.set('q', query.q);
	if (query.state) params.set('state', query.state);
	if (query.method) params.set('method', query.method);
	const sort = query.sort ?? DEFAULT_SORT;
	const order = query.order ?? firstOrder(sort);
	if (explicit || sort !== DEFAULT_SORT) params.set('sort', sort);
	if (explicit || order !== firstOrder(sort)) params.set('order', order);
	if (query.page > 1) params.set('page', String(query.page));
	if (query.pageSize) params.set('pageSize', String(query.pageSize));
	const text = params.toString();
	return text ? `?${text}` : '';
}

/** The query after clicking a column heading: the same column flips, another starts fresh. */
export function sortedBy(query: ListQuery, sort: SortKey): ListQuery {
	const current = query.sort ?? DEFAULT_SORT;
	const order =
		current === sort
			? (query.order ?? firstOrder(current)) === 'asc'
				? 'desc'
				: 'asc'
			: firstOrder(sort);
	return { ...query, sort, order, page: 1 };
}
