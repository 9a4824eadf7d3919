/**
 * The lower bound of a correlation sum from raw counts (docs/statistics.md §1): the convolution
 * of per-basis Beta confidence distributions, computed on a grid without Monte-Carlo error.
 * Lower: basis t contributes Beta(D_t, O_t + ε_t), upper: Beta(D_t + ε_t, O_t), where the one
 * "+1" of the exact limits (ε = 1) goes to a single basis, the one with the smallest total (the
 * largest weight 1/T_t), instead of to every basis. With equal totals and rare misses this is the
 * exact pooled (Garwood) limit; one basis alone is Clopper–Pearson (Biometrika 26, 404 (1934)).
 */
import type { CountTable } from './counts';
import {
	sumLowerQuantiles,
	sumStandardDeviation,
	sumUpperQuantile,
	type BetaTerm
} from './sum-quantile';

export interface BasisTotals {
	diagonal: number;
	rest: number;
}

export function basisTotals(table: CountTable, d: number): BasisTotals {
	let diagonal = 0;
	let total = 0;
	for (let c = 0; c < d * d; c++) total += table.counts[c];
	for (let a = 0; a < d; a++) diagonal += table.counts[a * d + a];
	return { diagonal, rest: total - diagonal };
}

/**
 * The basis that takes the "+1": the largest weight per count w_t/T_t (for a plain sum, the
 * smallest total) among those where it changes the term.
 */
function correctedBasis(
	totals: BasisTotals[],
	weights: number[],
	counts: (t: BasisTotals) => boolean
): number {
	let best = -1;
	let bestWeight = -Infinity;
	totals.forEach((t, i) => {
		const perCount = weights[i] / (t.diagonal + t.rest);
		if (counts(t) && perCount > bestWeight) [best, bestWeight] = [i, perCount];
	});
	return best;
}

/** The lower confidence distribution's terms: D_t > 0 is needed for the "+1" to matter. */
export function lowerTerms(totals: BasisTotals[], weights: number[]): BetaTerm[] {
	const plusOne = correctedBasis(totals, weights, (t) => t.diagonal > 0);
	return totals.map((t, i) => ({
		a: t.diagonal,
		b: t.rest + (i === plusOne ? 1 : 0),
		weight: weights[i]
	}));
}

/** The upper one, mirrored: the "+1" on the matching side, where O_t > 0. */
export function upperTerms(totals: BasisTotals[], weights: number[]): BetaTerm[] {
	const plusOne = correctedBasis(totals, weights, (t) => t.rest > 0);
	return totals.map((t, i) => ({
		a: t.diagonal + (i === plusOne ? 1 : 0),
		b: t.rest,
		weight: weights[i]
	}));
}

/** Lower and upper terms of Σ w_t·P_t for the tables (weights default to 1). */
export function sumTerms(tables: CountTable[], d: number, weights = tables.map(() => 1)) {
	const totals = tables.map((t) => basisTotals(t, d));
	return { lower: lowerTerms(totals, weights), upper: upperTerms(totals, weights) };
}

export interface SumBound {
	lower: number;
	interval95: [number, number];
	standardError: number;
}

export function exactSumBound(tables: CountTable[], d: number, confidence: number): SumBound {
	const terms = sumTerms(tables, d);
	const [lower, low95] = sumLowerQuantiles(terms.lower, [1 - confidence, 0.025]);
	return {
		lower,
		interval95: [low95, sumUpperQuantile(terms.upper, 0.975)],
		standardError: sumStandardDeviation(terms.lower)
	};
}
