/**
 * Two-basis fidelity bound, device-dependent (witnesses.md §4.3): a lower bound F̃ on
 * F = ⟨Φ_d|ρ|Φ_d⟩ from the full computational table and the Fourier matching probabilities,
 *   F̃ = (1/d)[Σ_m p_0(m,m) + d·Σ_j p_1(j,j) − 1 − Γ],
 *   Γ = Σ_{δ≠0} [(Σ_m √p_0(m, m−δ))² − Σ_m p_0(m, m−δ)],
 * with m − δ in the group of the declared Fourier convention (bases.ts: mod d for cyclic,
 * digit-wise mod p for field). Bavaresco et al., Nat. Phys. 14, 1032 (2018); bound
 * SN ≤ r ⇒ F ≤ r/d from Terhal & Horodecki, Phys. Rev. A 61, 040301(R) (2000).
 */
import { labelDifference, type FourierConvention } from '../bases';
import type { PoissonModel } from '../model';
import type { WitnessFamily } from './types';

const differenceCache = new Map<string, Int32Array>();

/** For each cell a·d + b of the computational table, the group difference a − b (cached: read-only). */
function differenceOfCells(d: number, fourier?: FourierConvention): Int32Array {
	const key = `${d}:${fourier ?? ''}`;
	const cached = differenceCache.get(key);
	if (cached) return cached;
	const minus = labelDifference(d, fourier);
	const out = new Int32Array(d * d);
	for (let a = 0; a < d; a++) for (let b = 0; b < d; b++) out[a * d + b] = minus(a, b);
	differenceCache.set(key, out);
	return out;
}

/** F̃ from the computational weights w0 (any scale, total t0) and the Fourier matching fraction. */
function fidelityLowerBound(
	w0: ArrayLike<number>,
	t0: number,
	fourierMatching: number,
	d: number,
	delta: Int32Array,
	sqrtSums: Float64Array,
	sums: Float64Array
): number {
	sqrtSums.fill(0);
	sums.fill(0);
	for (let c = 0; c < d * d; c++) {
		sqrtSums[delta[c]] += Math.sqrt(w0[c]);
		sums[delta[c]] += w0[c];
	}
	let gamma = 0;
	for (let k = 1; k < d; k++) gamma += sqrtSums[k] * sqrtSums[k] - sums[k];
	return (sums[0] / t0 + d * fourierMatching - 1 - gamma / t0) / d;
}

/**
 * ∂F̃/∂x for the model's variables: with p = N/T_0 and g_c = ∂F̃/∂p_c (1/d on the diagonal,
 * −(Σ_group √p/√p_c − 1)/d off it), ∂F̃/∂N_c = (g_c − Σ_k g_k p_k)/T_0; the Fourier totals give
 * ∂/∂D_1 = O_1/T_1² and ∂/∂O_1 = −D_1/T_1². Cells with no counts get slope 0 (zero variance).
 */
function fidelityGradient(x: Float64Array, d: number, delta: Int32Array): Float64Array {
	const cells = d * d;
	let t0 = 0;
	for (let c = 0; c < cells; c++) t0 += x[c];
	const sqrtSums = new Float64Array(d);
	for (let c = 0; c < cells; c++) sqrtSums[delta[c]] += Math.sqrt(x[c] / t0);
	const g = new Float64Array(x.length);
	let mean = 0;
	for (let c = 0; c < cells; c++) {
		const p = x[c] / t0;
		if (delta[c] === 0) g[c] = 1 / d;
		else if (p > 0) g[c] = -(sqrtSums[delta[c]] / Math.sqrt(p) - 1) / d;
		mean += g[c] * p;
	}
	for (let c = 0; c < cells; c++) g[c] = x[c] > 0 ? (g[c] - mean) / t0 : 0;
	const [diagonal, off] = [x[cells], x[cells + 1]];
	const t1 = diagonal + off;
	g[cells] = off / (t1 * t1);
	g[cells + 1] = -diagonal / (t1 * t1);
	return g;
}

export const fidelityTwoBasis: WitnessFamily = {
	id: 'fidelity-two-basis',
	title: 'Two-basis fidelity bound',
	trust: 'device-dependent',
	reference:
		'Bavaresco et al., Nat. Phys. 14, 1032 (2018); Terhal & Horodecki, Phys. Rev. A 61, 040301(R) (2000)',
	symbol: 'F̃',
	statisticName: 'lower bound on the fidelity with the maximally entangled state',
	maximum: () => 1,
	trustedSides: 'both sides trusted',
	formula: 'F̃ ≤ F = ⟨Φ_d|ρ|Φ_d⟩ from the computational table and the Fourier matches; F ≤ r/d.',
	trustNote: 'Both sides trusted; every cell of the computational basis is needed.',
	assumes: [
		'Both sides trusted, measuring the computational basis (0) and the Fourier basis (1).',
		'The whole computational table is recorded: the bound uses every cell, not only the matches.'
	],
	preferWhen:
		'The target state is close to the maximally entangled state Φ_d and you have only the computational and Fourier bases: a fidelity above r/d certifies Schmidt number above r.',
	basesNote: 'bases 0 and 1',
	defaultBases: () => [0, 1],
	checkBases(bases) {
		if (bases.length !== 2 || bases[0] !== 0 || bases[1] !== 1) {
			throw new RangeError(
				`this method uses bases 0,1 (computational, then Fourier), got ${bases.join(',')}`
			);
		}
	},
	bounds: (d) => Array.from({ length: d - 1 }, (_, i) => (i + 1) / d),
	statistic(p, d, _bases, fourier) {
		let matching = 0;
		for (let j = 0; j < d; j++) matching += p[1][j * d + j];
		return fidelityLowerBound(
			p[0],
			1,
			matching,
			d,
			differenceOfCells(d, fourier),
			new Float64Array(d),
			new Float64Array(d)
		);
	},
	/** Draws the d² computational cells, then the Fourier diagonal and off-diagonal totals (§6). */
	sufficientModel(tables, d, _bases, convention): PoissonModel {
		const [computational, fourier] = tables;
		const means = new Float64Array(d * d + 2);
		means.set(computational.counts);
		for (let c = 0; c < d * d; c++) {
			if (c % (d + 1) === 0) means[d * d] += fourier.counts[c];
			else means[d * d + 1] += fourier.counts[c];
		}
		const delta = differenceOfCells(d, convention);
		const sqrtSums = new Float64Array(d);
		const sums = new Float64Array(d);
		return {
			means,
			statistic(x) {
				let t0 = 0;
				for (let c = 0; c < d * d; c++) t0 += x[c];
				const t1 = x[d * d] + x[d * d + 1];
				const matching = t1 > 0 ? x[d * d] / t1 : 0;
				return t0 > 0 ? fidelityLowerBound(x, t0, matching, d, delta, sqrtSums, sums) : 0;
			},
			gradient: (x) => fidelityGradient(x, d, delta)
		};
	}
};
