/**
 * What a time-ordered trials file keeps in memory: typed arrays and running sums only, so that
 * 10⁷ trials cost a few bytes each (one 16-bit code per trial) and never an object per row.
 */

export type TrialsMode = 'trials' | 'blocks';

/** A typed array that doubles when full; `view()` is the filled part (no copy). */
export class GrowingArray<T extends Uint16Array | Uint32Array> {
	length = 0;
	constructor(private data: T) {}
	push(value: number): void {
		if (this.length === this.data.length) {
			const next = new (this.data.constructor as new (n: number) => T)(this.data.length * 2);
			next.set(this.data);
			this.data = next;
		}
		this.data[this.length++] = value;
	}
	view(): T {
		return this.data.subarray(0, this.length) as T;
	}
	/** The backing array with room for `more` values past `length`; fill it, then set `length`. */
	reserve(more: number): T {
		let size = this.data.length;
		while (size < this.length + more) size *= 2;
		if (size > this.data.length) {
			const next = new (this.data.constructor as new (n: number) => T)(size);
			next.set(this.data);
			this.data = next;
		}
		return this.data;
	}
}

/** Per-block sums as rows arrive: a block opens with its basis, then counts rows and matches. */
export class BlockSums {
	private readonly basis = new GrowingArray(new Uint16Array(64));
	private readonly rows = new GrowingArray(new Uint32Array(64));
	private readonly matches = new GrowingArray(new Uint32Array(64));
	/** The open block's basis, −1 before the first. */
	current = -1;
	open(basis: number): void {
		this.basis.push(basis);
		this.rows.push(0);
		this.matches.push(0);
		this.current = basis;
	}
	count(match: boolean): void {
		this.rows.view()[this.rows.length - 1]++;
		if (match) this.matches.view()[this.matches.length - 1]++;
	}
	view(): TrialBlocks {
		return { basis: this.basis.view(), rows: this.rows.view(), matches: this.matches.view() };
	}
}

/** One setting (basis) per block; rows and matching rows counted per block. */
export interface TrialBlocks {
	basis: Uint16Array;
	rows: Uint32Array;
	matches: Uint32Array;
}

export interface TrialsData {
	dimension: number;
	mode: TrialsMode;
	/** Rows read (coincidences). */
	trials: number;
	/** Per trial (mode `trials`): basis·2 + 1{a = b}, in time order; empty in mode `blocks`. */
	codes: Uint16Array;
	/** Per block (mode `blocks`), in time order; null in mode `trials`. */
	blocks: TrialBlocks | null;
	/** The trials summed: one d×d count table per basis present (cells a·d + b). */
	tables: Map<number, Float64Array>;
	/** Which optional columns the file has. */
	hasTime: boolean;
	hasBlock: boolean;
}

/** Bases in order of the settings sequence: per trial, or per block. */
export function settingSequence(data: TrialsData): Uint16Array {
	if (data.blocks) return data.blocks.basis;
	const out = new Uint16Array(data.codes.length);
	for (let i = 0; i < out.length; i++) out[i] = data.codes[i] >> 1;
	return out;
}
