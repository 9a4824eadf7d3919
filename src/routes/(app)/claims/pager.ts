/** What the pager says about where a page lies in a list: one rule, also past the end. */
export interface PagePlace {
	/** Pages there are (at least 1, an empty list being one empty page). */
	pages: number;
	/** 1-based range of items on this page, or null when the page holds none. */
	range: [number, number] | null;
	/** Set when the asked-for page lies beyond the last one. */
	pastTheEnd: boolean;
}

export function pagePlace(page: number, pageSize: number, total: number): PagePlace {
	const pages = Math.max(1, Math.ceil(total / pageSize));
	const first = (page - 1) * pageSize + 1;
	if (total === 0 || first > total) return { pages, range: null, pastTheEnd: page > pages };
	return { pages, range: [first, Math.min(total, page * pageSize)], pastTheEnd: false };
}

/** The pager's sentence, e.g. "21–28 of 28 claims, page 2 of 2". */
export function pageStatus(page: number, pageSize: number, total: number, noun = 'claim'): string {
	const { pages, range, pastTheEnd } = pagePlace(page, pageSize, total);
	const count = `${total.toLocaleString('en')} ${noun}${total === 1 ? '' : 's'}`;
	if (total === 0) return `No ${noun}s to show`;
	if (pastTheEnd)
		return `Page ${page} is past the end: ${count} fill ${pages} page${pages === 1 ? '' : 's'}`;
	if (!range) return count;
	const [first, last] = range;
	const where = first === last ? `${first}` : `${first}–${last}`;
	return pages === 1 ? `${where} of ${count}` : `${where} of ${count}, page ${page} of ${pages}`;
}
