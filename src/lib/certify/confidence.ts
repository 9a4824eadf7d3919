/**
 * Confidence-distribution draws of a weighted matching sum Σ_t w_t·P_t, P_t = Σ_a p_t(a, a)
 * (docs/statistics.md). A *lower* replicate draws each P_t from a distribution whose
 * α-quantile is an exact lower confidence limit; an *upper* replicate the mirror image:
 * - sufficient totals (raw counts): P_t ~ Beta(D_t, O_t + 1) below, Beta(D_t + 1, O_t) above,
 *   so one basis alone gives exactly the Clopper–Pearson limits (Biometrika 26, 404 (1934));
 * - per cell (rates, accidental subtraction): matching cells ~ Gamma(n), the others
 *   ~ Gamma(n + 1) below and the other way round above (Garwood, Biometrika 28, 437 (1936));
 *   the sum is monotone in those directions. Accidental estimates are taken as exact.
 * Draw order per replicate: the lower replicate's variables, then the upper one's, tables in
 * the claim's basis order (per cell: row-major). Engine 2.1.0: replicates come in fixed blocks of
 * BLOCK_RESAMPLES, block b from its own stream (GammaSampler(seed, b)), so that blocks may run on
 * any number of threads and give the same numbers.
 */
import type { CountTable } from './counts';
import { GammaSampler } from './gamma';

export interface MatchingSumDraws {
	lower(g: GammaSampler): number;
	upper(g: GammaSampler): number;
}

export interface DrawWeights {
	lower: number[];
	upper: number[];
}

const ones = (n: number) => new Array(n).fill(1);

function diagonalAndRest(table: CountTable, d: number): [number, number] {
	let diagonal = 0;
	let total = 0;
	for (let c = 0; c < d * d; c++) total += table.counts[c];
	for (let a = 0; a < d; a++) diagonal += table.counts[a * d + a];
	return [diagonal, total - diagonal];
}

/** Beta draws on the per-basis totals (D_t, O_t) of raw counts; plain loops: the CLI's hot path. */
export function sufficientDraws(
	tables: CountTable[],
	d: number,
	weights: DrawWeights = { lower: ones(tables.length), upper: ones(tables.length) }
): MatchingSumDraws {
	const n = tables.length;
	const diagonal = new Float64Array(n);
	const rest = new Float64Array(n);
	tables.forEach((t, i) => ([diagonal[i], rest[i]] = diagonalAndRest(t, d)));
	const lowerWeights = Float64Array.from(weights.lower);
	const upperWeights = Float64Array.from(weights.upper);
	return {
		lower(g) {
			let s = 0;
			for (let i = 0; i < n; i++) s += lowerWeights[i] * g.beta(diagonal[i], rest[i] + 1);
			return s;
		},
		upper(g) {
			let s = 0;
			for (let i = 0; i < n; i++) s += upperWeights[i] * g.beta(diagonal[i] + 1, rest[i]);
			return s;
		}
	};
}

/** Gamma draws cell by cell, then the file's rates and accidental subtraction, then normalising. */
export function perCellDraws(
	tables: CountTable[],
	d: number,
	subtractAccidentals: boolean,
	weights: DrawWeights = { lower: ones(tables.length), upper: ones(tables.length) }
): MatchingSumDraws {
	function replicate(g: GammaSampler, matchingExtra: number, weightsNow: number[]): number {
		let s = 0;
		tables.forEach((table, i) => {
			let total = 0;
			let diagonal = 0;
			for (let c = 0; c < d * d; c++) {
				const matching = c % (d + 1) === 0;
				let x = g.gamma(table.counts[c] + (matching ? matchingExtra : 1 - matchingExtra));
				if (subtractAccidentals && table.accidentals) x = Math.max(0, x - table.accidentals[c]);
				if (table.durations) x /= table.durations[c];
				total += x;
				if (matching) diagonal += x;
			}
			if (total > 0) s += (weightsNow[i] * diagonal) / total;
		});
		return s;
	}
	return {
		lower: (g) => replicate(g, 0, weights.lower),
		upper: (g) => replicate(g, 1, weights.upper)
	};
}

/** Everything a thread needs to rebuild the draws (plain data: it crosses worker boundaries). */
export interface DrawSpec {
	kind: 'sufficient' | 'per-cell';
	tables: CountTable[];
	d: number;
	subtractAccidentals: boolean;
	weights?: DrawWeights;
}

export function drawsOf(spec: DrawSpec): MatchingSumDraws {
	return spec.kind === 'sufficient'
		? sufficientDraws(spec.tables, spec.d, spec.weights)
		: perCellDraws(spec.tables, spec.d, spec.subtractAccidentals, spec.weights);
}

/** Gamma variates one replicate (lower and upper) costs: a guide for splitting work over threads. */
export function drawsPerReplicate(spec: DrawSpec): number {
	return spec.kind === 'sufficient' ? 8 * spec.tables.length : 2 * spec.d ** 2 * spec.tables.length;
}

/** Resamples per block; part of the reproducibility contract (changing it changes the numbers). */
export const BLOCK_RESAMPLES = 1000;

export function blockCount(resamples: number): number {
	return Math.ceil(resamples / BLOCK_RESAMPLES);
}

export interface Replicates {
	lower: Float64Array;
	upper: Float64Array;
}

export interface ReplicateOptions {
	resamples: number;
	seed: number;
	/** Called with the fraction done, about a hundred times per run. */
	onProgress?: (fraction: number) => void;
}

/**
 * Blocks [from, to) of a run of `resamples`: block b holds replicates b·BLOCK_RESAMPLES onwards,
 * each its lower draw, then its upper draw, from the block's stream. Returns that slice.
 */
export function drawBlocks(
	draws: MatchingSumDraws,
	resamples: number,
	seed: number,
	from: number,
	to: number,
	onReplicate?: () => void
): Replicates {
	const first = from * BLOCK_RESAMPLES;
	const end = Math.min(resamples, to * BLOCK_RESAMPLES);
	const lower = new Float64Array(Math.max(0, end - first));
	const upper = new Float64Array(lower.length);
	for (let b = from; b < to; b++) {
		const g = new GammaSampler(seed, b);
		const stop = Math.min(end, (b + 1) * BLOCK_RESAMPLES);
		for (let r = b * BLOCK_RESAMPLES; r < stop; r++) {
			lower[r - first] = draws.lower(g);
			upper[r - first] = draws.upper(g);
			onReplicate?.();
		}
	}
	return { lower, upper };
}

/** All blocks of a run in this thread (the server's check worker, the browser, the tests). */
export function drawReplicates(draws: MatchingSumDraws, options: ReplicateOptions): Replicates {
	const { resamples, onProgress } = options;
	const step = Math.max(1, Math.floor(resamples / 100));
	let done = 0;
	const tick = onProgress
		? () => {
				done++;
				if (done % step === 0) onProgress(done / resamples);
			}
		: undefined;
	return drawBlocks(draws, resamples, options.seed, 0, blockCount(resamples), tick);
}
