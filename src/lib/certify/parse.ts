import type { CountsDataset } from './counts';
import { parseCountsCsv } from './counts-csv';
import { looksLikeGrid, parseCountsGrid } from './counts-grid';
import { parseCountsJson } from './counts-json';

/**
 * A counts file in any form: JSON when its first non-blank character is `{`; a grid file when its
 * first data line is numbers only (counts-grid.ts); else long-form CSV.
 */
export function parseCounts(
	input: Uint8Array | string,
	dimension: number,
	format?: 'csv' | 'json'
): CountsDataset {
	const head = (
		typeof input === 'string' ? input.slice(0, 64) : new TextDecoder().decode(input.subarray(0, 64))
	)
		.replace(/^\uFEFF/, '')
		.trimStart();
	const kind = format ?? (head.startsWith('{') ? 'json' : 'csv');
	if (kind === 'json') return parseCountsJson(input, dimension);
	return isGrid(input) ? parseCountsGrid(input, dimension) : parseCountsCsv(input, dimension);
}

/** Grid or long form, from the first few kilobytes (a header line is never longer). */
function isGrid(input: Uint8Array | string): boolean {
	const head =
		typeof input === 'string'
			? input.slice(0, 16_384)
			: new TextDecoder().decode(input.subarray(0, 16_384));
	return looksLikeGrid(head.replace(/^\uFEFF/, ''));
}
