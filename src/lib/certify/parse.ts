import { InputError, type CountsDataset } from './counts';
import type { TableBudget } from './counts-budget';
import { parseCountsCsv } from './counts-csv';
import { looksLikeGrid, parseCountsGrid } from './counts-grid';
import { parseCountsJson } from './counts-json';
import { isCountsSet, parseCountsSet } from './counts-set';

/**
 * A counts file in any form: a counts set (several files uploaded together, counts-set.ts) by its
 * first line; JSON when its first non-blank character is `{`; a grid file when its first data
 * line is numbers only (counts-grid.ts); else long-form CSV.
 */
export function parseCounts(
	input: Uint8Array | string,
	dimension: number,
	format?: 'csv' | 'json'
): CountsDataset {
	if (format !== 'json' && isCountsSet(input))
		return parseCountsSet(input, dimension, (file, d, budget) =>
			parseOneFile(file.bytes, d, file.basis, budget)
		);
	return parseOneFile(input, dimension, null, undefined, format);
}

/** One file; `basis` is the basis given beside a file that holds a single unnamed grid. */
function parseOneFile(
	input: Uint8Array | string,
	dimension: number,
	basis: number | null,
	budget?: TableBudget,
	format?: 'csv' | 'json'
): CountsDataset {
	const head = (
		typeof input === 'string' ? input.slice(0, 64) : new TextDecoder().decode(input.subarray(0, 64))
	)
		.replace(/^\uFEFF/, '')
		.trimStart();
	const kind = format ?? (head.startsWith('{') ? 'json' : 'csv');
	const grid = kind === 'csv' && isGrid(input);
	if (basis !== null && !grid)
		throw new InputError(
			'a basis given beside a file applies to a grid file only; this file names its bases'
		);
	if (kind === 'json') return parseCountsJson(input, dimension, budget);
	return grid ? parseCountsGrid(input, dimension, basis) : parseCountsCsv(input, dimension, budget);
}

/** Grid or long form, from the first few kilobytes (a header line is never longer). */
function isGrid(input: Uint8Array | string): boolean {
	const head =
		typeof input === 'string'
			? input.slice(0, 16_384)
			: new TextDecoder().decode(input.subarray(0, 16_384));
	return looksLikeGrid(head.replace(/^\uFEFF/, ''));
}
