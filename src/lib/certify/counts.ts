/**
 * Count tables: one d×d table of coincidence counts per measurement basis, as read from a
 * counts file (product.md, "Counts file format"). Cells are indexed `a * d + b`.
 */
import {
	basisExistsInAnyConvention,
	conventionsDiffer,
	MAX_DIMENSION,
	MIN_DIMENSION,
	type FourierConvention
} from './bases';

export interface CountTable {
	basis: number;
	counts: Float64Array;
	/** Estimated accidental (background) counts per cell, when the file gives them. */
	accidentals: Float64Array | null;
	/** Integration time of each cell in seconds, when the file gives it. */
	durations: Float64Array | null;
	/** 1 where the file has a row for the cell. */
	present: Uint8Array;
}

export interface CountsDataset {
	dimension: number;
	/** Tables in ascending basis order. */
	tables: CountTable[];
	/** The Fourier convention the file itself declares (JSON `"fourier"`), and where. */
	declaredFourier?: { convention: FourierConvention; line: number; column: number };
	/** How the file was read, in words, when its layout was detected (grid files). */
	readAs?: string;
}

/** Bad input (a file, an option): the message names the line and column, or the field, where it can. */
export class InputError extends Error {
	constructor(
		message: string,
		readonly line?: number,
		readonly column?: number
	) {
		super(
			line === undefined ? message : `line ${line}${column ? `, column ${column}` : ''}: ${message}`
		);
		this.name = 'InputError';
	}
}

/** Digits only: how CSV and JSON files alike write a count, basis or outcome (no sign, point or exponent). */
export const WHOLE_NUMBER_TEXT = /^\d+$/;

export const MAX_COUNTS_FILE_BYTES = 20 * 1024 * 1024;

export function checkDimension(d: unknown, where = 'dimension'): number {
	if (typeof d !== 'number' || !Number.isInteger(d) || d < MIN_DIMENSION || d > MAX_DIMENSION) {
		throw new InputError(
			`${where} must be a whole number from ${MIN_DIMENSION} to ${MAX_DIMENSION}, got ${String(d)}`
		);
	}
	return d;
}

export function emptyTable(
	d: number,
	basis: number,
	extras: { accidentals: boolean; durations: boolean }
): CountTable {
	return {
		basis,
		counts: new Float64Array(d * d),
		accidentals: extras.accidentals ? new Float64Array(d * d) : null,
		durations: extras.durations ? new Float64Array(d * d).fill(1) : null,
		present: new Uint8Array(d * d)
	};
}

export function checkBasis(
	d: number,
	basis: number,
	where: string,
	line?: number,
	column?: number
): void {
	if (!basisExistsInAnyConvention(d, basis)) {
		const hint =
			d > 2
				? `0 and 1 exist in every dimension; 2..${d} only when ${d} is a prime power`
				: '0, 1 and 2 exist';
		throw new InputError(
			`${where}: basis ${basis} does not exist in dimension ${d} (${hint})`,
			line,
			column
		);
	}
}

/**
 * Throws when the file declares a Fourier convention other than the one the check uses
 * (`by`: "the claim", "--fourier"); for prime d and non-prime-powers the two name the same bases.
 */
export function checkDeclaredFourier(
	dataset: CountsDataset,
	fourier: FourierConvention,
	by: string
): void {
	const declared = dataset.declaredFourier;
	if (!declared || declared.convention === fourier || !conventionsDiffer(dataset.dimension)) return;
	throw new InputError(
		`$.fourier: the file declares "${declared.convention}" but ${by} says "${fourier}"; in d = ${dataset.dimension} these are different bases — make them agree`,
		declared.line,
		declared.column
	);
}

/**
 * Throws unless every cell of every listed basis is present: the normalisation T_t of
 * witnesses.md §3 sums all d² cells, so a missing cell cannot be told from an unmeasured one.
 */
export function requireCompleteTables(
	dataset: CountsDataset,
	bases: number[],
	method: string
): void {
	const d = dataset.dimension;
	for (const t of bases) {
		const table = dataset.tables.find((x) => x.basis === t);
		if (!table)
			throw new InputError(`method ${method} needs basis ${t}, which the file does not contain`);
		const missing = table.present.indexOf(0);
		if (missing >= 0) {
			throw new InputError(
				`basis ${t} is incomplete: no row for outcome_a=${Math.floor(missing / d)}, outcome_b=${missing % d} ` +
					`(method ${method} needs all ${d * d} cells of each basis it uses)`
			);
		}
		const total = table.counts.reduce((s, c) => s + c, 0);
		if (total <= 0) throw new InputError(`basis ${t} has no counts at all`);
	}
}

/** Decodes bytes as UTF-8 (rejecting invalid sequences) and drops a leading byte-order mark. */
/** The line holding the first byte that is not UTF-8: the longest valid prefix, by bisection. */
function lineOfFirstBadByte(bytes: Uint8Array): number {
	const valid = (end: number) => {
		try {
			new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, end), { stream: true });
			return true;
		} catch {
			return false;
		}
	};
	// A sequence cut off by the end of the file fails only when the stream closes.
	let bad = bytes.length;
	if (!valid(bytes.length)) {
		let good = 0;
		while (bad - good > 1) {
			const middle = (good + bad) >>> 1;
			if (valid(middle)) good = middle;
			else bad = middle;
		}
	}
	let line = 1;
	for (let i = 0; i < bad - 1; i++) if (bytes[i] === 0x0a) line++;
	return line;
}

export function decodeCountsText(
	input: Uint8Array | string,
	limit = MAX_COUNTS_FILE_BYTES
): string {
	const size =
		typeof input === 'string' ? new TextEncoder().encode(input).length : input.byteLength;
	if (size > limit) {
		throw new InputError(
			`the file is ${size} bytes; the limit is ${limit} bytes (${limit / 2 ** 20} MiB)`
		);
	}
	let text: string;
	try {
		text =
			typeof input === 'string' ? input : new TextDecoder('utf-8', { fatal: true }).decode(input);
	} catch {
		throw new InputError('not valid UTF-8 text', lineOfFirstBadByte(input as Uint8Array));
	}
	if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
	if (text.trim() === '') throw new InputError('the file is empty');
	return text;
}
