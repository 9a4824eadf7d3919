/** Pieces of reading CSV counts lines that never make more strings than a row has columns. */

/** The fields of a trimmed line, at most `limit` of them, each trimmed. */
export const splitFields = (raw: string, limit: number) =>
	raw.split(',', limit).map((f) => f.trim());

export function fieldCount(raw: string): number {
	let count = 1;
	for (let at = raw.indexOf(','); at >= 0; at = raw.indexOf(',', at + 1)) count++;
	return count;
}

/**
 * The line that first filled a cell, found again only when a duplicate is met (keeping a line
 * number per cell would cost 4 bytes × d² × bases for every file).
 */
export function firstLineOf(text: string, size: number, at: number[], cell: number[]): number {
	let lineNo = 0;
	for (let start = 0; start <= text.length;) {
		let end = text.indexOf('\n', start);
		if (end < 0) end = text.length;
		lineNo++;
		const fields = splitFields(text.slice(start, end).trim(), size);
		if (
			at.every((index, k) => /^\d+$/.test(fields[index] ?? '') && Number(fields[index]) === cell[k])
		)
			return lineNo;
		start = end + 1;
	}
	return 0;
}
