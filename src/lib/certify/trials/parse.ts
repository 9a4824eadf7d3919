/**
 * Time-ordered trials CSV: header `basis,outcome_a,outcome_b[,time_s][,block]` (any order), one row
 * per coincidence in time order, `#` comments, LF or CRLF, UTF-8 BOM. Read in chunks, byte by byte,
 * so a file of any size (or an inflating gzip stream) is held only as one code per trial.
 */
import { checkBasis, checkDimension, InputError } from '../counts';
import { plainFields } from './plain-fields';
import { BlockSums, GrowingArray, type TrialsData, type TrialsMode } from './store';

const COLUMNS = ['basis', 'outcome_a', 'outcome_b', 'time_s', 'block'] as const;
type Column = (typeof COLUMNS)[number];
const REQUIRED: Column[] = ['basis', 'outcome_a', 'outcome_b'];
/** More rows than this are refused: 16-bit codes keep that at 200 MB. */
export const MAX_TRIALS = 100_000_000;
const DECIMAL = /^(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const COMMA = 0x2c;
const NEWLINE = 0x0a;

export class TrialsParser {
	private line = 0;
	private carry: Uint8Array = new Uint8Array(0);
	private columns: Map<Column, number> | null = null;
	private fields: number[] = [];
	/** Field index of each column (−1 when absent), read once from the header. */
	private at: Record<Column, number> = {
		basis: 0,
		outcome_a: 1,
		outcome_b: 2,
		time_s: -1,
		block: -1
	};
	private readonly codes = new GrowingArray(new Uint16Array(1024));
	private readonly blocks = new BlockSums();
	private readonly tables = new Map<number, Float64Array>();
	/** The same tables by basis: a table exists only once its basis passed checkBasis. */
	private readonly tableOf: (Float64Array | undefined)[] = [];
	/** Header of exactly basis, outcome_a, outcome_b in mode trials: plain rows take the fast path. */
	private plain = false;
	private readonly row = new Int32Array(3);
	private trials = 0;
	private lastTime = -Infinity;
	private lastBlock = -1;
	/** Bases already checked to exist in this dimension (1 = yes). */
	private readonly knownBasis = new Uint8Array(1 << 16);

	constructor(
		readonly dimension: number,
		readonly mode: TrialsMode
	) {
		checkDimension(dimension);
	}

	/** Feeds the next bytes of the file; whole lines are read now, a cut line waits for the rest. */
	push(chunk: Uint8Array): void {
		let bytes = chunk;
		if (this.carry.length > 0) {
			bytes = new Uint8Array(this.carry.length + chunk.length);
			bytes.set(this.carry);
			bytes.set(chunk, this.carry.length);
		}
		let start = 0;
		for (;;) {
			if (this.plain) start = this.plainRows(bytes, start);
			const end = bytes.indexOf(NEWLINE, start);
			if (end < 0) break;
			this.readLine(bytes, start, end);
			start = end + 1;
		}
		this.carry = bytes.slice(start);
	}

	finish(): TrialsData {
		if (this.carry.length > 0) this.readLine(this.carry, 0, this.carry.length);
		this.carry = new Uint8Array(0);
		if (!this.columns) throw new InputError('the file is empty (no header line)');
		if (this.trials === 0) throw new InputError('the file has a header but no trials');
		const blocks = this.mode === 'blocks';
		return {
			dimension: this.dimension,
			mode: this.mode,
			trials: this.trials,
			codes: blocks ? new Uint16Array(0) : this.codes.view(),
			blocks: blocks ? this.blocks.view() : null,
			tables: this.tables,
			hasTime: this.columns.has('time_s'),
			hasBlock: this.columns.has('block')
		};
	}

	private readLine(bytes: Uint8Array, start: number, end: number): void {
		this.line++;
		if (this.line === 1 && bytes[start] === 0xef && bytes[start + 1] === 0xbb) start += 3;
		if (end > start && bytes[end - 1] === 0x0d) end--;
		while (start < end && (bytes[start] === 0x20 || bytes[start] === 0x09)) start++;
		if (start === end || bytes[start] === 0x23) return;
		this.fields.length = 0;
		this.fields.push(start);
		for (let i = start; i < end; i++) if (bytes[i] === COMMA) this.fields.push(i + 1);
		this.fields.push(end + 1);
		if (!this.columns) this.readHeader(bytes);
		else this.readRow(bytes);
	}

	private text(bytes: Uint8Array, field: number): string {
		const from = this.fields[field];
		return String.fromCharCode(...bytes.subarray(from, this.fields[field + 1] - 1)).trim();
	}

	private readHeader(bytes: Uint8Array): void {
		const columns = new Map<Column, number>();
		for (let f = 0; f < this.fields.length - 1; f++) {
			const name = this.text(bytes, f);
			if (!(COLUMNS as readonly string[]).includes(name) || columns.has(name as Column))
				throw new InputError(
					`${columns.has(name as Column) ? 'repeated' : 'unknown'} column '${name}' (expected ${COLUMNS.join(', ')})`,
					this.line,
					f + 1
				);
			columns.set(name as Column, f);
		}
		for (const name of REQUIRED)
			if (!columns.has(name)) throw new InputError(`the header lacks column '${name}'`, this.line);
		if (this.mode === 'blocks' && !columns.has('block'))
			throw new InputError(`mode blocks needs a 'block' column`, this.line);
		this.columns = columns;
		for (const name of COLUMNS) this.at[name] = columns.get(name) ?? -1;
		this.plain = this.mode === 'trials' && columns.size === 3;
	}

	/**
	 * Reads rows of three short digit fields ending in LF, as readRow would, from `start` on; stops
	 * at the first line that is anything else (cut, CR, space, comment, an error to name) and
	 * returns where it starts, for readLine.
	 */
	private plainRows(bytes: Uint8Array, start: number): number {
		const { row, tableOf, dimension: d } = this;
		const { basis: at0, outcome_a: at1, outcome_b: at2 } = this.at;
		// A plain row takes at least 6 bytes ("0,0,0\n"): room for every row left in `bytes`.
		const codes = this.codes.reserve(Math.ceil((bytes.length - start) / 6));
		const first = this.codes.length;
		const room = MAX_TRIALS - this.trials;
		let p = start;
		let n = 0;
		while (n < room) {
			const q = plainFields(bytes, p, row);
			if (q < 0) break;
			const basis = row[at0];
			const a = row[at1];
			const b = row[at2];
			const table = tableOf[basis];
			if (table === undefined || a >= d || b >= d) break;
			table[a * d + b]++;
			codes[first + n++] = basis * 2 + (a === b ? 1 : 0);
			p = q;
		}
		this.line += n;
		this.trials += n;
		this.codes.length += n;
		return p;
	}

	/** A whole number from digits only; the field's 1-based column names it in errors. */
	private whole(bytes: Uint8Array, column: Column): number {
		const f = this.at[column];
		const from = this.fields[f];
		const to = this.fields[f + 1] - 1;
		let value = 0;
		for (let i = from; i < to; i++) {
			const digit = bytes[i] - 0x30;
			if (digit < 0 || digit > 9 || i - from > 12) {
				value = -1;
				break;
			}
			value = value * 10 + digit;
		}
		if (to === from || value < 0)
			throw new InputError(
				`${column} must be a whole number, got '${this.text(bytes, f)}'`,
				this.line,
				f + 1
			);
		return value;
	}

	private readRow(bytes: Uint8Array): void {
		const width = this.columns!.size;
		if (this.fields.length - 1 !== width)
			throw new InputError(
				`expected ${width} fields, got ${this.fields.length - 1}`,
				this.line,
				Math.min(width, this.fields.length - 1) + 1
			);
		if (this.trials >= MAX_TRIALS)
			throw new InputError(`more than ${MAX_TRIALS} trials; split the run`, this.line);
		const d = this.dimension;
		const basis = this.whole(bytes, 'basis');
		if (basis >= this.knownBasis.length || !this.knownBasis[basis]) {
			checkBasis(d, basis, 'basis', this.line, this.at.basis + 1);
			this.knownBasis[basis] = 1;
		}
		const a = this.outcome(bytes, 'outcome_a');
		const b = this.outcome(bytes, 'outcome_b');
		if (this.at.time_s >= 0) this.readTime(bytes);
		let table = this.tables.get(basis);
		if (!table) this.tables.set(basis, (this.tableOf[basis] = table = new Float64Array(d * d)));
		table[a * d + b]++;
		this.trials++;
		if (this.mode === 'trials') this.codes.push(basis * 2 + (a === b ? 1 : 0));
		else this.readBlock(bytes, basis, a === b);
	}

	private outcome(bytes: Uint8Array, name: 'outcome_a' | 'outcome_b'): number {
		const value = this.whole(bytes, name);
		if (value >= this.dimension)
			throw new InputError(
				`${name} must be 0..${this.dimension - 1}, got ${value}`,
				this.line,
				this.at[name] + 1
			);
		return value;
	}

	private readTime(bytes: Uint8Array): void {
		const f = this.at.time_s;
		const text = this.text(bytes, f);
		const time = Number(text);
		if (!DECIMAL.test(text) || !Number.isFinite(time))
			throw new InputError(`time_s must be a non-negative number, got '${text}'`, this.line, f + 1);
		if (time < this.lastTime)
			throw new InputError(
				`time_s ${text} is earlier than the row before (${this.lastTime}); rows must be in time order`,
				this.line,
				f + 1
			);
		this.lastTime = time;
	}

	private readBlock(bytes: Uint8Array, basis: number, match: boolean): void {
		const block = this.whole(bytes, 'block');
		if (block < this.lastBlock)
			throw new InputError(
				`block ${block} comes after block ${this.lastBlock}; blocks must be contiguous and in increasing order`,
				this.line,
				this.at.block + 1
			);
		if (block > this.lastBlock) this.blocks.open(basis);
		else if (this.blocks.current !== basis)
			throw new InputError(
				`block ${block} mixes bases ${this.blocks.current} and ${basis}; one setting per block`,
				this.line,
				this.at.basis + 1
			);
		this.lastBlock = block;
		this.blocks.count(match);
	}
}

/** Reads a whole file held in memory (the command line); the service feeds chunks instead. */
export function parseTrials(bytes: Uint8Array, dimension: number, mode: TrialsMode): TrialsData {
	const parser = new TrialsParser(dimension, mode);
	const step = 1 << 20;
	for (let i = 0; i < bytes.length; i += step) parser.push(bytes.subarray(i, i + step));
	return parser.finish();
}
