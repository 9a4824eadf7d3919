/**
 * The dimension a counts file speaks for itself, read cheaply: JSON states it; in CSV it is one
 * more than the largest outcome (every method needs all d² cells of a basis, so a complete file
 * reaches outcome d − 1). Null when the file is too broken to tell.
 */
import { decodeCountsText } from './counts';
import { splitFields } from './csv-lines';

const JSON_DIMENSION = /^\s*\{[\s\S]*?"dimension"\s*:\s*(\d+)\s*[,}]/;

/** Columns a header may name: more fields than this on a line are never read (a hostile row). */
const MAX_COLUMNS = 8;

function csvDimension(text: string): number | null {
	let columns: string[] | null = null;
	let largest = -1;
	// Line by line in place: splitting a 20 MiB file at once would copy it into millions of strings.
	for (let start = 0; start <= text.length;) {
		let end = text.indexOf('\n', start);
		if (end < 0) end = text.length;
		const raw = text.slice(start, end).trim();
		start = end + 1;
		if (raw === '' || raw.startsWith('#')) continue;
		const fields = splitFields(raw, MAX_COLUMNS);
		if (!columns) {
			columns = fields;
			continue;
		}
		for (const name of ['outcome_a', 'outcome_b']) {
			const value = fields[columns.indexOf(name)];
			if (value !== undefined && /^\d+$/.test(value)) largest = Math.max(largest, Number(value));
		}
	}
	return largest >= 0 ? largest + 1 : null;
}

export function fileDimension(input: Uint8Array | string): number | null {
	let text: string;
	try {
		text = decodeCountsText(input);
	} catch {
		return null;
	}
	if (text.trimStart().startsWith('{')) {
		const match = JSON_DIMENSION.exec(text.slice(0, 4096));
		return match ? Number(match[1]) : null;
	}
	return csvDimension(text);
}
