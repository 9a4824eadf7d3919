/** The parser's fast path: a plain row of the time-ordered trials CSV, read without strings. */

const COMMA = 0x2c;
const NEWLINE = 0x0a;

/**
 * Three fields of one to nine digits, comma-separated, ending in LF, from `p`: their values into
 * `row`, and the next line's start; −1 for any other line or one cut off by the end of `bytes`.
 */
export function plainFields(bytes: Uint8Array, p: number, row: Int32Array): number {
	let field = 0;
	let value = 0;
	let digits = 0;
	for (let q = p; q < bytes.length; q++) {
		const c = bytes[q];
		if (c >= 0x30 && c <= 0x39 && digits < 9) {
			value = value * 10 + (c - 0x30);
			digits++;
		} else if (digits === 0) return -1;
		else if (c === COMMA && field < 2) {
			row[field++] = value;
			value = digits = 0;
		} else if (c === NEWLINE && field === 2) {
			row[2] = value;
			return q + 1;
		} else return -1;
	}
	return -1;
}
