/**
 * Grid counts files, as labs keep them: one d × d matrix per basis (row = outcome a, column =
 * outcome b), each grid after a `# basis t` line, values separated by tabs, semicolons, commas
 * or spaces. The layout read is described ("read as 3 grids of 5 × 5, tab-separated").
 */
import {
	checkBasis,
	checkDimension,
	decodeCountsText,
	emptyTable,
	InputError,
	WHOLE_NUMBER_TEXT,
	type CountsDataset,
	type CountTable
} from './counts';

const BASIS_LINE = /^#\s*basis\s*[:=]?\s*(\S+)\s*$/i;
const SEPARATORS = [
	['\t', 'tab-separated'],
	[';', 'semicolon-separated'],
	[',', 'comma-separated'],
	[' ', 'space-separated']
] as const;
type Separator = (typeof SEPARATORS)[number];

/** The first line that is neither blank nor a comment, trimmed. */
function firstDataLine(text: string): string | null {
	for (const line of text.split('\n', 200)) {
		const raw = line.trim();
		if (raw && !raw.startsWith('#')) return raw;
	}
	return null;
}

/** A grid file's first data line is numbers only (a long-form file starts with its header). */
export function looksLikeGrid(text: string): boolean {
	const line = firstDataLine(text);
	return line !== null && /^[\d\s.;,eE+-]+$/.test(line) && /\d/.test(line);
}

const separatorOf = (row: string): Separator =>
	SEPARATORS.find(([s]) => row.includes(s)) ?? SEPARATORS[3];

function splitRow(row: string, [sep]: Separator): string[] {
	return sep === ' ' ? row.split(/\s+/) : row.split(sep).map((f) => f.trim());
}

interface GridState {
	d: number;
	separator: Separator | null;
	tables: Map<number, CountTable>;
	current: { table: CountTable; rows: number; line: number } | null;
	pendingBasis: { basis: number; line: number } | null;
	/** The basis given beside the file (a counts set's header), when the file names none itself. */
	given: number | null;
}

function startGrid(state: GridState, lineNo: number): CountTable {
	const { d, pendingBasis } = state;
	if (!pendingBasis)
		throw new InputError(
			state.tables.size === 0
				? "say which basis this grid is in: put a line '# basis 0' (or its number) before it, or give the basis beside the file"
				: "a grid starts here without a '# basis t' line before it",
			lineNo
		);
	const table = emptyTable(d, pendingBasis.basis, { accidentals: false, durations: false });
	state.tables.set(pendingBasis.basis, table);
	state.pendingBasis = null;
	state.current = { table, rows: 0, line: lineNo };
	return table;
}

function basisLine(state: GridState, text: string, lineNo: number): void {
	if (state.given !== null)
		throw new InputError(
			`the file names its bases itself ('# basis' lines): give no basis beside it`,
			lineNo
		);
	const given = BASIS_LINE.exec(text)![1];
	const column = text.indexOf(given) + 1;
	if (!WHOLE_NUMBER_TEXT.test(given))
		throw new InputError(`the basis must be a whole number, got '${given}'`, lineNo, column);
	const basis = Number(given);
	checkBasis(state.d, basis, 'basis', lineNo, column);
	if (state.tables.has(basis)) throw new InputError(`basis ${basis} has a grid already`, lineNo);
	closeGrid(state, lineNo);
	state.pendingBasis = { basis, line: lineNo };
}

function closeGrid(state: GridState, lineNo: number): void {
	const current = state.current;
	if (current && current.rows < state.d)
		throw new InputError(
			`the grid for basis ${current.table.basis} (from line ${current.line}) has ${current.rows} rows, not ${state.d}`,
			lineNo
		);
	state.current = null;
}

function gridRow(state: GridState, raw: string, lineNo: number): void {
	const { d } = state;
	state.separator ??= separatorOf(raw);
	const fields = splitRow(raw, state.separator);
	if (!state.current || state.current.rows === d) {
		if (state.current) state.current = null;
		startGrid(state, lineNo);
	}
	const current = state.current!;
	if (fields.length !== d)
		throw new InputError(`a grid row needs ${d} values (d = ${d}), found ${fields.length}`, lineNo);
	const a = current.rows++;
	fields.forEach((field, b) => {
		if (!WHOLE_NUMBER_TEXT.test(field))
			throw new InputError(
				`counts must be a non-negative whole number, got '${field}'`,
				lineNo,
				b + 1
			);
		const value = Number(field);
		if (!Number.isSafeInteger(value))
			throw new InputError(`counts ${field} is too large`, lineNo, b + 1);
		current.table.counts[a * d + b] = value;
		current.table.present[a * d + b] = 1;
	});
}

/** The basis given beside a file must be a whole number naming a basis of dimension d. */
function givenBasis(d: number, basis: number | null | undefined): number | null {
	if (basis === null || basis === undefined) return null;
	if (!Number.isSafeInteger(basis) || basis < 0)
		throw new InputError(`the basis given beside the file must be a whole number, got ${basis}`);
	checkBasis(d, basis, 'the basis given beside the file');
	return basis;
}

/**
 * Reads a grid file. `basis` is the basis given beside the file (the upload form, the API; kept
 * in the counts set): the file then holds one grid and no `# basis` line.
 */
export function parseCountsGrid(
	input: Uint8Array | string,
	dimension: number,
	basis?: number | null
): CountsDataset {
	const d = checkDimension(dimension);
	const text = decodeCountsText(input);
	const given = givenBasis(d, basis);
	const state: GridState = {
		d,
		separator: null,
		tables: new Map(),
		current: null,
		pendingBasis: given === null ? null : { basis: given, line: 1 },
		given
	};
	const lines = text.split('\n');
	lines.forEach((line, i) => {
		const raw = line.trim();
		if (BASIS_LINE.test(raw)) basisLine(state, raw, i + 1);
		else if (raw && !raw.startsWith('#')) gridRow(state, raw, i + 1);
	});
	closeGrid(state, lines.length);
	if (state.pendingBasis)
		throw new InputError(
			`basis ${state.pendingBasis.basis} has no grid after it`,
			state.pendingBasis.line
		);
	if (state.tables.size === 0) throw new InputError('the file holds no grid of counts');
	const tables = [...state.tables.values()].sort((x, y) => x.basis - y.basis);
	const n = tables.length;
	const givenWords = given === null ? '' : ` in basis ${given} (given with the upload)`;
	const grids = `${n} grid${n === 1 ? '' : 's'} of ${d} × ${d}${givenWords}`;
	const readAs = `read as ${grids}, ${state.separator![1]}`;
	return { dimension: d, tables, readAs };
}
