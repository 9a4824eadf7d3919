/**
 * One d×d matrix of a JSON counts table (counts, accidentals or durations), read value by value
 * into its own Float64Array. The first problem is kept, in the order a reader going row by row
 * would meet it: the number of rows first, then each row's length before its entries.
 */
import { digitsOnly } from './json-scan';

export type CellKind = 'whole' | 'positive' | 'nonnegative';

export const DIGITS_ONLY = ' (written with digits only, as in CSV)';

const EXPECTED = {
	whole: 'a non-negative whole number',
	positive: 'a positive number',
	nonnegative: 'a non-negative number'
};

export interface JsonProblem {
	offset: number;
	path: string;
	message: string;
}

/** One cell: counts as digits only (the CSV rule); other values any number, never negative (`-0`). */
function cellOk(text: string, v: unknown, offset: number, length: number, kind: CellKind): boolean {
	if (typeof v !== 'number' || !Number.isFinite(v) || text.charCodeAt(offset) === 45) return false;
	if (kind === 'whole') return digitsOnly(text, offset, length) && Number.isSafeInteger(v);
	return kind === 'positive' ? v > 0 : v >= 0;
}

export class MatrixReader {
	readonly cells: Float64Array;
	private rows = 0;
	private entries = 0;
	private rowOffset = 0;
	private rowProblem: JsonProblem | null = null;
	private problem: JsonProblem | null = null;

	constructor(
		private readonly text: string,
		private readonly d: number,
		readonly path: string,
		private readonly kind: CellKind,
		private readonly offset: number
	) {
		this.cells = new Float64Array(d * d);
	}

	rowBegin(offset: number): void {
		this.rowOffset = offset;
		this.entries = 0;
		this.rowProblem = null;
	}

	rowEnd(): void {
		const a = this.rows++;
		if (this.problem) return;
		if (this.entries !== this.d) this.problem = this.rowLength(this.rowOffset, a);
		else this.problem = this.rowProblem;
	}

	/** A row that is not an array. */
	notARow(offset: number): void {
		const a = this.rows++;
		this.problem ??= this.rowLength(offset, a);
	}

	/** An entry: a literal (its value), or an object or array (value undefined). */
	entry(value: unknown, offset: number, length: number, literal: boolean): void {
		const a = this.rows;
		const b = this.entries++;
		if (this.problem || this.rowProblem || b >= this.d || a >= this.d) return;
		const number = literal && typeof value === 'number';
		if (number && cellOk(this.text, value, offset, length, this.kind)) {
			this.cells[a * this.d + b] = value as number;
			return;
		}
		const written = number ? this.text.slice(offset, offset + length) : '';
		const shown = written || JSON.stringify(value ?? null);
		const digits = this.kind === 'whole' ? DIGITS_ONLY : '';
		this.rowProblem = {
			offset,
			path: `${this.path}[${a}][${b}]`,
			message: `expected ${EXPECTED[this.kind]}, got ${shown}${digits}`
		};
	}

	/** The first problem once the matrix has ended; null when all d² cells are good. */
	end(): JsonProblem | null {
		if (this.rows !== this.d) return MatrixReader.notAMatrix(this.offset, this.path, this.d);
		return this.problem;
	}

	static notAMatrix(offset: number, path: string, d: number): JsonProblem {
		return { offset, path, message: `expected ${d} rows` };
	}

	private rowLength(offset: number, a: number): JsonProblem {
		return { offset, path: `${this.path}[${a}]`, message: `expected ${this.d} entries` };
	}
}
