/**
 * Two-setting steering test, one-sided device-independent (witnesses.md §4.2):
 * W = Σ_{t∈{s,u}} Σ_a p_t(a, a) ≤ β_n = (1 + 1/√d)·2√n/(1 + √n) for Schmidt number ≤ n.
 * Method: Phys. Rev. Lett. 126, 200404 (2021); the n-preparable robustness bound
 * (√n − 1)/(√n + 1) from New J. Phys. 21, 113053 (2019). Valid, not tight, for 1 < n < d.
 */
import { checkDistinctAvailable, matchingSum, matchingSumModel } from './correlation-sum';
import type { WitnessFamily } from './types';

export function steeringBound(n: number, d: number): number {
	return ((1 + 1 / Math.sqrt(d)) * 2 * Math.sqrt(n)) / (1 + Math.sqrt(n));
}

/** SR ≥ W/(1 + 1/√d) − 1, from the witness F_{a|t} = |a_t*⟩⟨a_t*|/(1 + 1/√d); never below 0. */
export function steeringRobustnessBound(w: number, d: number): number {
	return Math.max(0, w / (1 + 1 / Math.sqrt(d)) - 1);
}

export const steering2Mub: WitnessFamily = {
	id: 'steering-2mub',
	title: 'Two-setting steering test',
	trust: 'one-sided device-independent',
	reference: 'Genuine high-dimensional quantum steering, Phys. Rev. Lett. 126, 200404 (2021)',
	symbol: 'W',
	statisticName: 'steering sum over two mutually unbiased bases',
	maximum: () => 2,
	trustedSides: 'side B trusted, side A untrusted',
	formula: 'W = Σₜ Σₐ pₜ(a, a) over two bases; W ≤ (1 + 1/√d)·2√r/(1 + √r).',
	trustNote: 'Side A is a black box; only side B’s measurements are trusted.',
	assumes: [
		'Only side B is trusted: its two measurements are the declared bases. Side A may be any device.',
		'Exactly two bases, each with all of its cells.'
	],
	preferWhen:
		'A referee will ask whether one detection station could be miscalibrated or untrusted: this test does not trust side A, at the price of a higher bar for each rung.',
	basesNote: 'exactly two bases',
	defaultBases: (present) =>
		present.includes(0) && present.includes(1) ? [0, 1] : present.slice(0, 2),
	checkBases(bases, d, fourier) {
		checkDistinctAvailable(bases, d, { min: 2, max: 2 }, fourier);
	},
	bounds: (d) => Array.from({ length: d - 1 }, (_, i) => steeringBound(i + 1, d)),
	statistic: (p, d) => matchingSum(p, d),
	sufficientModel: (tables, d) => matchingSumModel(tables, d),
	extras: (value, lower, d) => ({
		steeringRobustness: steeringRobustnessBound(value, d),
		steeringRobustnessLower: steeringRobustnessBound(lower, d)
	})
};
