import type { CountsDataset } from './counts';
import { parseCountsCsv } from './counts-csv';
import { parseCountsJson } from './counts-json';

/** A counts file in either form: JSON when its first non-blank character is `{`, else CSV. */
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
	return kind === 'json' ? parseCountsJson(input, dimension) : parseCountsCsv(input, dimension);
}
