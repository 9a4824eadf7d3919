/**
 * The second pass over JSON counts text: the first "tables" array, table by table, each matrix
 * read straight into its Float64Array after taking its d² numbers from the budget. A table's
 * problems are raised when it ends, in the order a tree reader would check them (its fields,
 * basis, counts, accidentals, durations), so the message is the same whatever order the file
 * writes the fields in.
 */
import { visit } from 'jsonc-parser';
import { basisExistsInAnyConvention } from './bases';
import { checkBasis, type CountTable } from './counts';
import type { TableBudget } from './counts-budget';
import { DIGITS_ONLY, MatrixReader, type CellKind, type JsonProblem } from './json-matrix';
import { digitsOnly, JSON_OPTIONS, type Spot } from './json-scan';

const MATRICES: Record<string, CellKind> = {
	counts: 'whole',
	accidentals: 'nonnegative',
	duration_s: 'positive'
};
const TABLE_KEYS = new Set(['basis', ...Object.keys(MATRICES)]);

export type Fail = (offset: number | undefined, path: string, message: string) => never;

/** One table object while it is read. */
class TableState {
	unknown: { key: string; offset: number } | null = null;
	basis: Spot | null = null;
	readonly matrices = new Map<string, MatrixReader | JsonProblem>();
	constructor(
		readonly path: string,
		readonly offset: number
	) {}
}

interface Context {
	text: string;
	d: number;
	fail: Fail;
	where: (offset: number) => { line: number; column: number };
	tables: Map<number, CountTable>;
}

function basisOf(ctx: Context, table: TableState): number {
	const { fail, text, d } = ctx;
	const path = `${table.path}.basis`;
	const node = table.basis;
	const value = node?.value;
	if (typeof value === 'number' && !digitsOnly(text, node!.offset, node!.length))
		fail(
			node!.offset,
			path,
			`expected a non-negative whole number, got ${text.slice(node!.offset, node!.offset + node!.length)}${DIGITS_ONLY}`
		);
	if (typeof value !== 'number' || !Number.isInteger(value) || value < 0)
		fail(node?.offset ?? table.offset, path, 'expected a non-negative whole number');
	const basis = value as number;
	if (!basisExistsInAnyConvention(d, basis)) {
		const at = ctx.where(node!.offset);
		checkBasis(d, basis, path, at.line, at.column);
	}
	if (ctx.tables.has(basis)) fail(node!.offset, path, `basis ${basis} appears twice`);
	return basis;
}

/** The finished table, or the first of its problems. */
function finishTable(ctx: Context, table: TableState): void {
	const { fail, d } = ctx;
	if (table.unknown)
		fail(table.unknown.offset, `${table.path}.${table.unknown.key}`, 'unknown field');
	const basis = basisOf(ctx, table);
	if (!table.matrices.has('counts')) fail(table.offset, table.path, 'missing field "counts"');
	const read = (key: string): Float64Array | null => {
		const matrix = table.matrices.get(key);
		if (!matrix) return null;
		const problem = matrix instanceof MatrixReader ? matrix.end() : matrix;
		if (problem) fail(problem.offset, problem.path, problem.message);
		return (matrix as MatrixReader).cells;
	};
	const counts = read('counts')!;
	const accidentals = read('accidentals');
	const durations = read('duration_s');
	const present = new Uint8Array(d * d).fill(1);
	ctx.tables.set(basis, { basis, counts, accidentals, durations, present });
}

/** Reads every table of the first "tables" array into ctx.tables, or fails at the first problem. */
export function readTables(ctx: Context, budget: TableBudget): void {
	const { text, d, fail } = ctx;
	let depth = 0;
	let rootKey: string | null = null;
	let inTables = false;
	let tablesSeen = false;
	let index = -1;
	let table: TableState | null = null;
	let key: string | null = null;
	let matrix: MatrixReader | null = null;
	const startMatrix = (offset: number) => {
		const path = `${table!.path}.${key}`;
		if (!budget.take(d * d)) fail(offset, path, budget.refusal);
		matrix = new MatrixReader(text, d, path, MATRICES[key!], offset);
		table!.matrices.set(key!, matrix);
	};
	/** A value begins at `depth` (1: a root field, 2: a table, 3: its field, 4: a row, 5: an entry); true to read its children. */
	const begin = (kind: Spot['kind'], offset: number, length: number, v: unknown): boolean => {
		if (depth === 1) {
			const first = rootKey === 'tables' && !tablesSeen;
			rootKey = null;
			if (!first) return false;
			tablesSeen = true;
			inTables = kind === 'array';
			return inTables;
		}
		if (!inTables) return false;
		if (depth === 2) {
			index++;
			const path = `$.tables[${index}]`;
			if (kind !== 'object') fail(offset, path, 'expected an object with "basis" and "counts"');
			table = new TableState(path, offset);
			return true;
		}
		if (depth === 3) {
			const k = key;
			key = null;
			if (k === 'basis' && !table!.basis) table!.basis = { kind, offset, length, value: v };
			else if (k !== null && k in MATRICES && !table!.matrices.has(k)) {
				key = k;
				if (kind === 'array') {
					startMatrix(offset);
					return true;
				}
				table!.matrices.set(k, MatrixReader.notAMatrix(offset, `${table!.path}.${k}`, d));
			}
			return false;
		}
		if (!matrix) return false;
		if (depth === 4) {
			if (kind === 'array') matrix.rowBegin(offset);
			else matrix.notARow(offset);
			return kind === 'array';
		}
		if (depth === 5) matrix.entry(v, offset, length, kind === 'literal');
		return false;
	};
	visit(
		text,
		{
			// A skipped value's end is still reported: depth counts every container begun.
			onObjectBegin: (offset, length) => {
				const open = depth === 0 || begin('object', offset, length, undefined);
				depth++;
				return open;
			},
			onArrayBegin: (offset, length) => {
				const open = depth > 0 && begin('array', offset, length, undefined);
				depth++;
				return open;
			},
			onObjectEnd: () => {
				if (--depth === 2 && table) {
					finishTable(ctx, table);
					table = null;
				}
			},
			onArrayEnd: () => {
				depth--;
				if (depth === 4) matrix?.rowEnd();
				else if (depth === 3) matrix = null;
				else if (depth === 1) inTables = false;
			},
			onLiteralValue: (v, offset, length) =>
				void (depth > 0 && begin('literal', offset, length, v)),
			onObjectProperty: (property, offset) => {
				if (depth === 1) rootKey = property;
				else if (depth === 3 && table) {
					key = property;
					if (!TABLE_KEYS.has(property)) table.unknown ??= { key: property, offset };
				}
			}
		},
		JSON_OPTIONS
	);
}
