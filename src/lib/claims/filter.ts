/**
 * The one claim filter: text search, state and method, as the claim list and the group archive
 * take them from the address or the API query; and the claim list's sort with its first direction,
 * the same on the page and in the API.
 */
import { z } from 'zod';
import { blankToUndefined } from '$lib/schema-numbers';
import { pageField, pageSizeField } from '$lib/paging';
import { SEARCH_MAX_LENGTH } from './claim-limits';
import { CLAIM_METHODS, CLAIM_SORTS } from './schema';
import { CLAIM_STATES } from './states';

/** The fields both lists filter by. */
export const claimFilterFields = {
	q: z.preprocess(blankToUndefined, z.string().trim().max(SEARCH_MAX_LENGTH).optional()),
	state: z.preprocess(
		blankToUndefined,
		z.enum(CLAIM_STATES, { error: `State must be one of ${CLAIM_STATES.join(', ')}.` }).optional()
	),
	method: z.preprocess(
		blankToUndefined,
		z
			.enum(CLAIM_METHODS, { error: `Method must be one of ${CLAIM_METHODS.join(', ')}.` })
			.optional()
	)
};

export type ClaimSort = (typeof CLAIM_SORTS)[number];
export const DEFAULT_SORT: ClaimSort = 'createdAt';

/** Newest first by default; text columns read best A→Z first. */
export const firstOrder = (sort: ClaimSort): 'asc' | 'desc' =>
	sort === 'title' || sort === 'state' ? 'asc' : 'desc';

/** The claim list's query: the filter, then sort, order and page. */
export const claimQuerySchema = z.object({
	...claimFilterFields,
	sort: z.preprocess(
		blankToUndefined,
		z.enum(CLAIM_SORTS, { error: `Sort must be one of ${CLAIM_SORTS.join(', ')}.` }).optional()
	),
	order: z.preprocess(
		blankToUndefined,
		z.enum(['asc', 'desc'], { error: 'Order must be asc or desc.' }).optional()
	),
	page: pageField(),
	pageSize: pageSizeField(100)
});

export type ClaimQuery = z.output<typeof claimQuerySchema>;
