/**
 * The matching-outcome sum S = Σ_{t∈K} Σ_a p_t(a, a) shared by the MUB correlation witness
 * and the two-setting steering test (witnesses.md §4.1, §4.2).
 */
import { basisProblem, DEFAULT_FOURIER, type FourierConvention } from '../bases';
import type { CountTable } from '../counts';
import type { PoissonModel } from '../model';

export function matchingSum(p: Float64Array[], d: number): number {
	let total = 0;
	for (const table of p) for (let a = 0; a < d; a++) total += table[a * d + a];
	return total;
}

/**
 * Per basis the sum depends only on the diagonal total D_t and the off-diagonal total O_t;
 * both are sums of independent Poisson cells and so Poisson themselves (§6), which makes
 * drawing (D_t, O_t) the same distribution as drawing every cell.
 */
export function matchingSumModel(tables: CountTable[], d: number): PoissonModel {
	const means = new Float64Array(2 * tables.length);
	tables.forEach((table, i) => {
		let diagonal = 0;
		let total = 0;
		for (let c = 0; c < d * d; c++) total += table.counts[c];
		for (let a = 0; a < d; a++) diagonal += table.counts[a * d + a];
		means[2 * i] = diagonal;
		means[2 * i + 1] = total - diagonal;
	});
	return {
		means,
		statistic(x) {
			let s = 0;
			for (let i = 0; i < x.length; i += 2) {
				const total = x[i] + x[i + 1];
				if (total > 0) s += x[i] / total;
			}
			return s;
		},
		gradient(x) {
			// ∂(D/T)/∂D = O/T², ∂(D/T)/∂O = −D/T².
			const g = new Float64Array(x.length);
			for (let i = 0; i < x.length; i += 2) {
				const total = x[i] + x[i + 1];
				if (total <= 0) continue;
				g[i] = x[i + 1] / (total * total);
				g[i + 1] = -x[i] / (total * total);
			}
			return g;
		}
	};
}

export function checkDistinctAvailable(
	bases: number[],
	d: number,
	count: { min: number; max: number },
	fourier: FourierConvention = DEFAULT_FOURIER
): void {
	if (new Set(bases).size !== bases.length)
		throw new RangeError(`bases must be distinct, got ${bases.join(',')}`);
	const problem = bases.map((t) => basisProblem(d, t, fourier)).find((x) => x !== null);
	if (problem) throw new RangeError(problem);
	if (bases.length < count.min || bases.length > count.max) {
		const wanted = count.min === count.max ? `exactly ${count.min}` : `at least ${count.min}`;
		throw new RangeError(`this method uses ${wanted} bases, got ${bases.length}`);
	}
}
