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

/** The reader's place in the text while jsonc-parser walks it. */
class TablesWalk {
	depth = 0;
	rootKey: string | null = null;
	inTables = false;
	tablesSeen = false;
	index = -1;
	table: TableState | null = null;
	key: string | null = null;
	matrix: MatrixReader | null = null;
	constructor(
		readonly ctx: Context,
		readonly budget: TableBudget
	) {}

	/** A value begins at `depth` (1: a root field, 2: a table, 3: its field, 4: a row, 5: an entry); true to read its children. */
	begin(kind: Spot['kind'], offset: number, length: number, v: unknown): boolean {
		if (this.depth === 1) return this.beginRootValue(kind);
		if (!this.inTables) return false;
		if (this.depth === 2) return this.beginTable(kind, offset);
		if (this.depth === 3) return this.beginField(kind, offset, length, v);
		const matrix = this.matrix;
		if (!matrix) return false;
		if (this.depth === 4) {
			if (kind === 'array') matrix.rowBegin(offset);
			else matrix.notARow(offset);
			return kind === 'array';
		}
		if (this.depth === 5) matrix.entry(v, offset, length, kind === 'literal');
		return false;
	}

	private beginRootValue(kind: Spot['kind']): boolean {
		const first = this.rootKey === 'tables' && !this.tablesSeen;
		this.rootKey = null;
		if (!first) return false;
		this.tablesSeen = true;
		this.inTables = kind === 'array';
		return this.inTables;
	}

	private beginTable(kind: Spot['kind'], offset: number): boolean {
		this.index++;
		const path = `$.tables[${this.index}]`;
		if (kind !== 'object')
			this.ctx.fail(offset, path, 'expected an object with "basis" and "counts"');
		this.table = new TableState(path, offset);
		return true;
	}

	private beginField(kind: Spot['kind'], offset: number, length: number, v: unknown): boolean {
		const table = this.table!;
		const k = this.key;
		this.key = null;
		if (k === 'basis' && !table.basis) table.basis = { kind, offset, length, value: v };
		else if (k !== null && k in MATRICES && !table.matrices.has(k)) {
			this.key = k;
			if (kind === 'array') {
				this.startMatrix(table, k, offset);
				return true;
			}
			table.matrices.set(k, MatrixReader.notAMatrix(offset, `${table.path}.${k}`, this.ctx.d));
		}
		return false;
	}

	private startMatrix(table: TableState, key: string, offset: number): void {
		const { text, d, fail } = this.ctx;
		const path = `${table.path}.${key}`;
		if (!this.budget.take(d * d)) fail(offset, path, this.budget.refusal);
		this.matrix = new MatrixReader(text, d, path, MATRICES[key], offset);
		table.matrices.set(key, this.matrix);
	}

	objectEnd(): void {
		if (--this.depth === 2 && this.table) {
			finishTable(this.ctx, this.table);
			this.table = null;
		}
	}

	arrayEnd(): void {
		this.depth--;
		if (this.depth === 4) this.matrix?.rowEnd();
		else if (this.depth === 3) this.matrix = null;
		else if (this.depth === 1) this.inTables = false;
	}

	property(property: string, offset: number): void {
		if (this.depth === 1) this.rootKey = property;
		else if (this.depth === 3 && this.table) {
			this.key = property;
			if (!TABLE_KEYS.has(property)) this.table.unknown ??= { key: property, offset };
		}
	}
}

/** Reads every table of the first "tables" array into ctx.tables, or fails at the first problem. */
export function readTables(ctx: Context, budget: TableBudget): void {
	const walk = new TablesWalk(ctx, budget);
	visit(
		ctx.text,
		{
			// A skipped value's end is still reported: depth counts every container begun.
			onObjectBegin: (offset, length) => {
				const open = walk.depth === 0 || walk.begin('object', offset, length, undefined);
				walk.depth++;
				return open;
			},
			onArrayBegin: (offset, length) => {
				const open = walk.depth > 0 && walk.begin('array', offset, length, undefined);
				walk.depth++;
				return open;
			},
			onObjectEnd: () => walk.objectEnd(),
			onArrayEnd: () => walk.arrayEnd(),
			onLiteralValue: (v, offset, length) =>
				void (walk.depth > 0 && walk.begin('literal', offset, length, v)),
			onObjectProperty: (property, offset) => walk.property(property, offset)
		},
		JSON_OPTIONS
	);
}
