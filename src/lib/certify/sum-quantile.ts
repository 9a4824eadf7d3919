/**
 * Quantiles of a weighted sum Σ w_t·X_t of independent Beta variables without Monte-Carlo error
 * (docs/statistics.md §6): each term is put on one grid of step h by rounding DOWN (the mass of
 * [kh, (k + 1)h) sits at kh, everything above a far upper cut at the cut), the terms are
 * convolved, and far lower tails are dropped and charged to the level. The discrete sum lies
 * below the true one, so `sumLowerQuantile` returns L with P(Σ ≤ L) ≤ q; it is at most
 * (terms + 1)·h below the exact quantile, and h is chosen so that this is ≤ 5 % of the sum’s SD
 * (coarser only beyond MAX_POINTS grid points, i.e. for hundreds of bases; still on the safe side).
 */
import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import betainc from '@stdlib/math-base-special-betainc';
import { convolve } from './convolve';

/** Beta(a, b) scaled by weight; a = 0 is the point 0, b = 0 the point `weight`. */
export interface BetaTerm {
	a: number;
	b: number;
	weight: number;
}

const RELATIVE_STEP = 0.05;
const MAX_POINTS = 1 << 15;
/** Mass left above the upper cut of each term (moved down to the cut: safe, only looser). */
const TOP_TAIL = 1e-13;

interface Grid {
	offset: number;
	p: Float64Array;
}

const variance = (t: BetaTerm) =>
	(t.weight ** 2 * t.a * t.b) / ((t.a + t.b) ** 2 * (t.a + t.b + 1));
const isPoint = (t: BetaTerm) => t.weight === 0 || t.a <= 0 || t.b <= 0;
const pointValue = (t: BetaTerm) => (t.weight !== 0 && t.a > 0 && t.b <= 0 ? t.weight : 0);

/** The standard deviation of Σ w_t·X_t. */
export function sumStandardDeviation(terms: BetaTerm[]): number {
	return Math.sqrt(terms.filter((t) => !isPoint(t)).reduce((s, t) => s + variance(t), 0));
}

/** One term on the grid, rounded down; the mass below its lower cut is returned as dropped. */
function discretise(t: BetaTerm, h: number, lowTail: number): Grid & { dropped: number } {
	const cdf = (x: number) => betainc(Math.min(1, Math.max(0, x / t.weight)), t.a, t.b);
	const lo = t.weight * betaQuantile(lowTail, t.a, t.b);
	const hi = t.weight * betaQuantile(1 - TOP_TAIL, t.a, t.b);
	const kLo = Math.floor(lo / h);
	const kHi = Math.max(kLo, Math.floor(hi / h));
	const p = new Float64Array(kHi - kLo + 1);
	const dropped = cdf(lo);
	let previous = dropped;
	for (let k = kLo; k < kHi; k++) {
		const next = cdf((k + 1) * h);
		p[k - kLo] = Math.max(0, next - previous);
		previous = Math.max(previous, next);
	}
	p[kHi - kLo] = Math.max(0, 1 - previous);
	return { offset: kLo, p, dropped };
}

/** Drops the lowest entries holding at most `lowTail` and folds the top TOP_TAIL into its cut. */
function trim(g: Grid, lowTail: number): Grid & { dropped: number } {
	let first = 0;
	let dropped = 0;
	while (first < g.p.length - 1 && dropped + g.p[first] <= lowTail) dropped += g.p[first++];
	let last = g.p.length - 1;
	let top = 0;
	while (last > first && top + g.p[last] <= TOP_TAIL) top += g.p[last--];
	const p = g.p.slice(first, last + 1);
	p[p.length - 1] += top;
	return { offset: g.offset + first, p, dropped };
}

/** L with P(Σ w_t·X_t ≤ L) ≤ q, at most (terms + 1)·h below the exact q-quantile. */
export function sumLowerQuantile(terms: BetaTerm[], q: number): number {
	return sumLowerQuantiles(terms, [q])[0];
}

/** sumLowerQuantile at several levels from one convolution (the tails are charged to the least). */
export function sumLowerQuantiles(terms: BetaTerm[], qs: number[]): number[] {
	const constant = terms.reduce((s, t) => s + (isPoint(t) ? pointValue(t) : 0), 0);
	const live = terms.filter((t) => !isPoint(t));
	if (live.length === 0) return qs.map(() => constant);
	if (live.length === 1)
		return qs.map((q) => constant + live[0].weight * betaQuantile(q, live[0].a, live[0].b));
	const sd = sumStandardDeviation(live);
	// Each term and the final read-out round down by less than h: (terms + 1)·h in all.
	const h = Math.max((RELATIVE_STEP * sd) / (live.length + 1), (14 * sd) / MAX_POINTS);
	const { grid, charged } = convolveTerms(live, h, (Math.min(...qs) * 1e-6) / (2 * live.length));
	return qs.map((q) => {
		if (charged > q) return constant;
		let cumulative = charged;
		let k = -1;
		while (k + 1 < grid.p.length && cumulative + grid.p[k + 1] <= q) cumulative += grid.p[++k];
		return Math.max(constant, constant + (grid.offset + k) * h);
	});
}

/** The rounded-down distribution of the sum of the terms, and the mass charged to the level. */
function convolveTerms(live: BetaTerm[], h: number, tail: number) {
	let charged = 0;
	let level: Grid[] = live.map((t) => {
		const term = discretise(t, h, tail);
		charged += term.dropped;
		return term;
	});
	// Pairwise (a balanced tree): early convolutions stay short.
	while (level.length > 1) {
		const next: Grid[] = [];
		for (let i = 0; i + 1 < level.length; i += 2) {
			const sum = convolve(level[i].p, level[i + 1].p);
			const trimmed = trim({ offset: level[i].offset + level[i + 1].offset, p: sum.values }, tail);
			charged += trimmed.dropped + sum.l1Error;
			next.push(trimmed);
		}
		if (level.length % 2 === 1) next.push(level[level.length - 1]);
		level = next;
	}
	return { grid: level[0], charged };
}

/** U with P(Σ w_t·X_t ≥ U) ≤ 1 − q: the mirror image (w − X ~ w·Beta(b, a)) of the lower one. */
export function sumUpperQuantile(terms: BetaTerm[], q: number): number {
	const total = terms.reduce((s, t) => s + t.weight, 0);
	return (
		total -
		sumLowerQuantile(
			terms.map((t) => ({ a: t.b, b: t.a, weight: t.weight })),
			1 - q
		)
	);
}
