/**
 * Long-form counts CSV (product.md): header `basis,outcome_a,outcome_b,counts` plus optional
 * `accidentals` and `duration_s` columns in any order; `#` comment lines, LF or CRLF, UTF-8 BOM.
 */
import {
	checkBasis,
	checkDimension,
	InputError,
	decodeCountsText,
	emptyTable,
	type CountsDataset,
	type CountTable,
	WHOLE_NUMBER_TEXT
} from './counts';

const REQUIRED = ['basis', 'outcome_a', 'outcome_b', 'counts'] as const;
const OPTIONAL = ['accidentals', 'duration_s'] as const;
type Column = (typeof REQUIRED)[number] | (typeof OPTIONAL)[number];

const WHOLE = WHOLE_NUMBER_TEXT;
const DECIMAL = /^(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function wholeNumber(text: string, what: string, line: number, column: number): number {
	if (!WHOLE.test(text))
		throw new InputError(
			`${what} must be a non-negative whole number, got '${text}'`,
			line,
			column
		);
	const value = Number(text);
	if (!Number.isSafeInteger(value))
		throw new InputError(`${what} ${text} is too large`, line, column);
	return value;
}

function decimal(
	text: string,
	what: string,
	line: number,
	column: number,
	positive: boolean
): number {
	const value = Number(text);
	if (!DECIMAL.test(text) || !Number.isFinite(value) || (positive && value <= 0)) {
		const kind = positive ? 'a positive number' : 'a non-negative number';
		throw new InputError(`${what} must be ${kind}, got '${text}'`, line, column);
	}
	return value;
}

function readHeader(fields: string[], line: number): Map<Column, number> {
	const known = new Set<string>([...REQUIRED, ...OPTIONAL]);
	const columns = new Map<Column, number>();
	fields.forEach((name, i) => {
		if (!known.has(name)) {
			throw new InputError(
				`unknown column '${name}' (expected ${[...REQUIRED, ...OPTIONAL].join(', ')})`,
				line,
				i + 1
			);
		}
		if (columns.has(name as Column))
			throw new InputError(`column '${name}' appears twice`, line, i + 1);
		columns.set(name as Column, i);
	});
	const missing = REQUIRED.filter((name) => !columns.has(name));
	if (missing.length)
		throw new InputError(`the header lacks column(s) ${missing.join(', ')}`, line);
	return columns;
}

/** An outcome label in 0..d − 1 from field `index` (0-based) of a row. */
function outcome(fields: string[], index: number, name: Column, line: number, d: number): number {
	const value = wholeNumber(fields[index], name, line, index + 1);
	if (value >= d) throw new InputError(`${name} ${value} is outside 0..${d - 1}`, line, index + 1);
	return value;
}

export function parseCountsCsv(input: Uint8Array | string, dimension: number): CountsDataset {
	const d = checkDimension(dimension);
	const lines = decodeCountsText(input).split(/\r?\n/);
	let columns: Map<Column, number> | null = null;
	const tables = new Map<number, CountTable>();
	// Per basis, the line that first filled each cell (0: not yet), for the duplicate message.
	const firstLine = new Map<number, Int32Array>();
	for (let i = 0; i < lines.length; i++) {
		const lineNo = i + 1;
		const raw = lines[i].trim();
		if (raw === '' || raw.startsWith('#')) continue;
		const fields = raw.split(',').map((f) => f.trim());
		if (!columns) {
			columns = readHeader(fields, lineNo);
			continue;
		}
		if (fields.length !== columns.size) {
			throw new InputError(`expected ${columns.size} fields, found ${fields.length}`, lineNo);
		}
		const at = (name: Column) => columns!.get(name)!;
		const basis = wholeNumber(fields[at('basis')], 'basis', lineNo, at('basis') + 1);
		if (!tables.has(basis)) checkBasis(d, basis, 'basis', lineNo, at('basis') + 1);
		const a = outcome(fields, at('outcome_a'), 'outcome_a', lineNo, d);
		const b = outcome(fields, at('outcome_b'), 'outcome_b', lineNo, d);
		let table = tables.get(basis);
		if (!table) {
			table = emptyTable(d, basis, {
				accidentals: columns.has('accidentals'),
				durations: columns.has('duration_s')
			});
			tables.set(basis, table);
			firstLine.set(basis, new Int32Array(d * d));
		}
		const cell = a * d + b;
		const filledBy = firstLine.get(basis)!;
		if (filledBy[cell] !== 0) {
			throw new InputError(
				`duplicate cell basis=${basis}, outcome_a=${a}, outcome_b=${b} (first on line ${filledBy[cell]})`,
				lineNo
			);
		}
		filledBy[cell] = lineNo;
		table.present[cell] = 1;
		table.counts[cell] = wholeNumber(fields[at('counts')], 'counts', lineNo, at('counts') + 1);
		if (table.accidentals) {
			table.accidentals[cell] = decimal(
				fields[at('accidentals')],
				'accidentals',
				lineNo,
				at('accidentals') + 1,
				false
			);
		}
		if (table.durations) {
			table.durations[cell] = decimal(
				fields[at('duration_s')],
				'duration_s',
				lineNo,
				at('duration_s') + 1,
				true
			);
		}
	}
	if (!columns) throw new InputError('the file has no header line');
	if (tables.size === 0) throw new InputError('the file has a header but no data rows');
	return { dimension: d, tables: [...tables.values()].sort((x, y) => x.basis - y.basis) };
}
