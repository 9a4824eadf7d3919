/**
 * MUB correlation sum, device-dependent (witnesses.md §4.1). SN ≤ r ⇒ S ≤ 1 + (m − 1)·r/d.
 * r = 1: Spengler et al., Phys. Rev. A 86, 022311 (2012); general r: Morelli, Huber &
 * Tavakoli, Phys. Rev. Lett. 131, 170201 (2023).
 */
import { availableBases, DEFAULT_FOURIER } from '../bases';
import { checkDistinctAvailable, matchingSum, matchingSumModel } from './correlation-sum';
import type { WitnessFamily } from './types';

export const mubCorrelation: WitnessFamily = {
	id: 'mub-correlation',
	title: 'MUB correlation sum',
	trust: 'device-dependent',
	reference:
		'Spengler et al., Phys. Rev. A 86, 022311 (2012); Morelli, Huber & Tavakoli, Phys. Rev. Lett. 131, 170201 (2023)',
	symbol: 'S',
	statisticName: 'correlation sum over m mutually unbiased bases',
	// Each basis adds a matching probability of at most 1.
	maximum: (bases) => bases.length,
	trustedSides: 'both sides trusted',
	formula: 'S = Σₜ Σₐ pₜ(a, a) over m mutually unbiased bases; S ≤ 1 + (m − 1)·r/d.',
	trustNote: 'Both sides’ measurements are trusted to be the declared bases.',
	assumes: [
		'Both sides measure projections onto the declared mutually unbiased bases; a tilted or mislabelled basis can inflate the sum.',
		'Every cell of each basis used is recorded; the sum uses the matching outcomes pₜ(a, a).'
	],
	preferWhen:
		'You trust both detection stations and have three or more bases: each added basis raises the sum a high Schmidt number can reach faster than the bound, so the ladder separates rungs better.',
	basesNote: 'two or more bases',
	defaultBases: (present) => present,
	checkBases(bases, d, fourier = DEFAULT_FOURIER) {
		const max = Math.max(2, availableBases(d, fourier).length);
		checkDistinctAvailable(bases, d, { min: 2, max }, fourier);
	},
	bounds(d, bases) {
		const m = bases.length;
		return Array.from({ length: d - 1 }, (_, i) => 1 + ((m - 1) * (i + 1)) / d);
	},
	statistic: (p, d) => matchingSum(p, d),
	sufficientModel: (tables, d) => matchingSumModel(tables, d)
};
