/**
 * The dimension a counts file speaks for itself, read cheaply: JSON states it; in CSV it is one
 * more than the largest outcome (every method needs all d² cells of a basis, so a complete file
 * reaches outcome d − 1). Null when the file is too broken to tell.
 */
import { decodeCountsText } from './counts';

const JSON_DIMENSION = /^\s*\{[\s\S]*?"dimension"\s*:\s*(\d+)\s*[,}]/;

function csvDimension(text: string): number | null {
	let columns: string[] | null = null;
	let largest = -1;
	for (const line of text.split(/\r?\n/)) {
		const raw = line.trim();
		if (raw === '' || raw.startsWith('#')) continue;
		const fields = raw.split(',').map((f) => f.trim());
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
