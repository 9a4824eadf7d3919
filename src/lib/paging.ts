/**
 * The one rule for `page` and `pageSize` in every list, page and API: whole numbers within
 * bounds, or a 400 naming the field. A page past MAX_PAGE could only be empty, and a number such
 * as 1e20 would reach SQL as `OFFSET 5e+21`, which SQLite refuses.
 */
import { z } from 'zod';
import { blankToUndefined, wholeNumber } from '$lib/schema-numbers';

/** The highest page any list answers. */
export const MAX_PAGE = 1_000_000;

/** `page` from a query string: blank or missing means the first. */
export const pageField = () =>
	z.preprocess(blankToUndefined, wholeNumber('The page', 1, MAX_PAGE, 'form').optional());

/** `pageSize` from a query string, up to `max`; blank or missing means the list's default. */
export const pageSizeField = (max: number) =>
	z.preprocess(blankToUndefined, wholeNumber('The page size', 1, max, 'form').optional());

/** `?page=&pageSize=` alone, for lists that take nothing else. */
export const pagingSchema = (maxPageSize: number) =>
	z.object({ page: pageField(), pageSize: pageSizeField(maxPageSize) });
