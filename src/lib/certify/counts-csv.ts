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
import { TableBudget } from './counts-budget';
import { fieldCount, firstLineOf, splitFields } from './csv-lines';

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

interface ParseState {
	d: number;
	text: string;
	columns: Map<Column, number> | null;
	tables: Map<number, CountTable>;
	budget: TableBudget;
}

/** `byteLimit`: the upload cap unless the caller has bounded the bytes otherwise (a bundle's file). */
export function parseCountsCsv(
	input: Uint8Array | string,
	dimension: number,
	budget = new TableBudget(),
	byteLimit?: number
): CountsDataset {
	const d = checkDimension(dimension);
	const text = decodeCountsText(input, byteLimit);
	const state: ParseState = { d, text, columns: null, tables: new Map(), budget };
	const values = new Float64Array(REQUIRED.length + OPTIONAL.length);
	let lineNo = 0;
	for (let start = 0; start <= text.length;) {
		let end = text.indexOf('\n', start);
		if (end < 0) end = text.length;
		lineNo++;
		if (!plainRow(state, text, start, end, lineNo, values))
			anyRow(state, text.slice(start, end), lineNo);
		start = end + 1;
	}
	if (!state.columns) throw new InputError('the file has no header line');
	if (state.tables.size === 0) throw new InputError('the file has a header but no data rows');
	const tables = [...state.tables.values()];
	return { dimension: d, tables: tables.sort((x, y) => x.basis - y.basis) };
}

/**
 * The common row, stored without making strings: whole numbers only, no spaces, an existing
 * basis, outcomes in range, a new cell, no extra columns. False leaves the row to anyRow, which
 * stores it or words the error.
 */
function plainRow(
	state: ParseState,
	text: string,
	start: number,
	end: number,
	lineNo: number,
	values: Float64Array
): boolean {
	const { columns, d } = state;
	if (!columns || columns.size !== REQUIRED.length) return false;
	if (end > start && text.charCodeAt(end - 1) === 13) end--; // CRLF
	let field = 0;
	let value = 0;
	let digits = 0;
	for (let i = start; i <= end; i++) {
		const c = i < end ? text.charCodeAt(i) : 44;
		if (c >= 48 && c <= 57 && digits < 15) {
			value = value * 10 + (c - 48);
			digits++;
		} else if (c === 44 && digits > 0 && field < REQUIRED.length) {
			values[field++] = value;
			value = 0;
			digits = 0;
		} else return false;
	}
	if (field !== REQUIRED.length) return false;
	const basis = values[columns.get('basis')!];
	const a = values[columns.get('outcome_a')!];
	const b = values[columns.get('outcome_b')!];
	const table = state.tables.get(basis);
	if (!table || a >= d || b >= d || table.present[a * d + b] !== 0) return false;
	table.present[a * d + b] = 1;
	table.counts[a * d + b] = values[columns.get('counts')!];
	return true;
}

/** Any line: blank, comment, header or row, with every check worded (line and column). */
function anyRow(state: ParseState, line: string, lineNo: number): void {
	const { d, tables } = state;
	const raw = line.trim();
	if (raw === '' || raw.startsWith('#')) return;
	const columns = state.columns;
	if (!columns) {
		// Seven fields always hold the header's first fault: only six names are known.
		state.columns = readHeader(splitFields(raw, OPTIONAL.length + REQUIRED.length + 1), lineNo);
		return;
	}
	// Counted before splitting: a row of ten million fields must not become ten million strings.
	const found = fieldCount(raw);
	if (found !== columns.size) {
		throw new InputError(`expected ${columns.size} fields, found ${found}`, lineNo);
	}
	const fields = splitFields(raw, columns.size);
	const at = (name: Column) => columns.get(name)!;
	const basis = wholeNumber(fields[at('basis')], 'basis', lineNo, at('basis') + 1);
	if (!tables.has(basis)) checkBasis(d, basis, 'basis', lineNo, at('basis') + 1);
	const a = outcome(fields, at('outcome_a'), 'outcome_a', lineNo, d);
	const b = outcome(fields, at('outcome_b'), 'outcome_b', lineNo, d);
	const table = tables.get(basis) ?? newTable(state, basis, lineNo);
	const cell = a * d + b;
	if (table.present[cell] !== 0) {
		const at = (['basis', 'outcome_a', 'outcome_b'] as const).map((name) => columns.get(name)!);
		const first = firstLineOf(state.text, columns.size, at, [basis, a, b]);
		throw new InputError(
			`duplicate cell basis=${basis}, outcome_a=${a}, outcome_b=${b} (first on line ${first})`,
			lineNo
		);
	}
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

/** A basis's table, once its numbers fit the file's budget (tables are d² each, however few rows). */
function newTable(state: ParseState, basis: number, lineNo: number): CountTable {
	const extras = {
		accidentals: state.columns!.has('accidentals'),
		durations: state.columns!.has('duration_s')
	};
	const kinds = 1 + Number(extras.accidentals) + Number(extras.durations);
	if (!state.budget.take(kinds * state.d * state.d))
		throw new InputError(`basis ${basis}: ${state.budget.refusal}`, lineNo);
	const table = emptyTable(state.d, basis, extras);
	state.tables.set(basis, table);
	return table;
}
