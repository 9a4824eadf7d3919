/**
 * The statistic, its lower confidence bound and its 95 % interval (docs/statistics.md).
 * Correlation sums: confidence-distribution draws of S. Fidelity: the bound at confidence 1/2 is
 * reported (the plug-in F̃ beside it), and its lower bound is the better of the floor
 * P_0 + P_1 − 1 (draws, at the full error) and the cell limits (exact, at the error left over).
 */
import {
	lowerOrderStatistic as below,
	standardDeviation,
	upperOrderStatistic as above
} from './bootstrap';
import { perCellModel } from './cell-model';
import {
	drawReplicates,
	drawsOf,
	type DrawSpec,
	type ReplicateOptions,
	type Replicates
} from './confidence';
import type { CountTable } from './counts';
import { fidelityCellLimits } from './fidelity-limits';
import { deltaMethodStandardError, type PoissonModel } from './model';
import { matchingSum } from './witnesses/correlation-sum';
import type { FourierConvention } from './bases';
import type { WitnessFamily } from './witnesses';

export type BoundMethod =
	'clopper-pearson-sum' | 'garwood-cells-sum' | 'fidelity-floor' | 'fidelity-cell-limits';

export interface StatisticBound {
	value: number;
	/** SD of the lower replicates of the quantity the bound is built on (S, or the fidelity floor). */
	standardError: number;
	lower: number;
	interval95: [number, number];
	deltaMethodStandardError: number;
	boundMethod: BoundMethod;
	boundNote: string;
	/** Fidelity only: P_0 + P_1 − 1 at the data, the floor F̃ never falls below. */
	floorValue?: number;
	/** Fidelity only: the published plug-in F̃ at the data, biased upward (not the reported value). */
	plugInValue?: number;
}

export interface BoundInputs extends ReplicateOptions {
	family: WitnessFamily;
	tables: CountTable[];
	d: number;
	bases: number[];
	fourier: FourierConvention;
	confidence: number;
	/** Rates or accidental subtraction: per-cell draws, no exact cell limits. */
	perCell: boolean;
	subtractAccidentals: boolean;
	/** Replicates drawn elsewhere (worker threads) from boundDrawSpec; else drawn here. */
	replicates?: Replicates;
}

const sorted = (x: Float64Array) => Float64Array.from(x).sort();

function pointModel(o: BoundInputs, statistic: (p: Float64Array[]) => number): PoissonModel {
	return o.perCell
		? perCellModel(o.tables, o.d, statistic, { subtractAccidentals: o.subtractAccidentals })
		: o.family.sufficientModel(o.tables, o.d, o.bases, o.fourier);
}

type SpecInputs = Pick<BoundInputs, 'perCell' | 'tables' | 'd' | 'subtractAccidentals'>;

/**
 * What a bound draws: correlation sums the plain matching sum; the fidelity method lower
 * replicates of P_0 + P_1 (the floor + 1) and upper ones of P_0 + d·P_1 (F̃·d + 1 + Γ).
 */
export function boundDrawSpec(o: SpecInputs, fidelity: boolean): DrawSpec {
	return {
		kind: o.perCell ? 'per-cell' : 'sufficient',
		tables: o.tables,
		d: o.d,
		subtractAccidentals: o.subtractAccidentals,
		weights: fidelity ? { lower: [1, 1], upper: [1, o.d] } : undefined
	};
}

function replicatesOf(o: BoundInputs, fidelity: boolean): Replicates {
	return o.replicates ?? drawReplicates(drawsOf(boundDrawSpec(o, fidelity)), o);
}

export function correlationSumBound(o: BoundInputs): StatisticBound {
	const model = pointModel(o, (p) => o.family.statistic(p, o.d, o.bases, o.fourier));
	const reps = replicatesOf(o, false);
	const [lower, upper] = [sorted(reps.lower), sorted(reps.upper)];
	const exact = !o.perCell;
	return {
		value: model.statistic(model.means),
		standardError: standardDeviation(reps.lower),
		lower: below(lower, 1 - o.confidence),
		interval95: [below(lower, 0.025), above(upper, 0.975)],
		deltaMethodStandardError: deltaMethodStandardError(model),
		boundMethod: exact ? 'clopper-pearson-sum' : 'garwood-cells-sum',
		boundNote: exact
			? 'Lower bound from draws of each basis’s matching fraction from its exact (Clopper–Pearson) confidence distribution, summed over the bases.'
			: 'Lower bound from exact (Garwood) confidence-distribution draws of every cell, matching cells low and the others high; accidental estimates, where subtracted, are taken as exact.'
	};
}

/**
 * The error an order statistic leaves unspent: x_(k), k = ⌊q(B + 1)⌋, spends k/(B + 1) ≤ q
 * (bootstrap.ts), and the rest q − k/(B + 1) goes to the cell limits, so that the floor is the
 * two-basis sum's own bound at the full error and the union bound still totals q.
 */
function unspent(q: number, resamples: number): number {
	const k = Math.max(1, Math.floor(q * (resamples + 1) + 1e-9));
	return Math.max(0, q - k / (resamples + 1));
}

export function fidelityBound(o: BoundInputs): StatisticBound {
	const { d } = o;
	const alpha = 1 - o.confidence;
	const model = pointModel(o, (p) => o.family.statistic(p, d, o.bases, o.fourier));
	const reps = replicatesOf(o, true);
	const [lower, upper] = [sorted(reps.lower), sorted(reps.upper)];
	const B = lower.length;
	const cells = (error: number) =>
		o.perCell || !(error > 0)
			? -Infinity
			: fidelityCellLimits(o.tables, d, error, (p) => o.family.statistic(p, d, o.bases, o.fourier));
	// At error q: the floor at the order statistic of q (as mub-correlation on the same bases), the
	// cell limits at what that order statistic leaves unspent (docs/statistics.md §2).
	const at = (q: number) => ({ floor: below(lower, q) - 1, cells: cells(unspent(q, B)) });
	const bound = at(alpha);
	const byCells = bound.cells > bound.floor;
	// The reported value: the same bound at confidence 1/2, above the true F̃ in at most half of
	// experiments; the plug-in F̃ is biased upward by √ of sparse cells (docs/statistics.md §2).
	const median = at(0.5);
	const low95 = at(0.025);
	const floorModel = perCellModel(o.tables, d, (p) => matchingSum(p, d) - 1, {
		subtractAccidentals: o.subtractAccidentals
	});
	return {
		value: Math.max(median.floor, median.cells),
		plugInValue: model.statistic(model.means),
		standardError: standardDeviation(reps.lower),
		lower: Math.max(bound.floor, bound.cells),
		interval95: [Math.max(low95.floor, low95.cells), (above(upper, 0.975) - 1) / d],
		deltaMethodStandardError: deltaMethodStandardError(model),
		boundMethod: byCells ? 'fidelity-cell-limits' : 'fidelity-floor',
		boundNote: byCells
			? 'Lower bound from exact per-cell limits: Clopper–Pearson limits on both matching fractions and on every off-diagonal computational cell, combined by the union bound at the error the floor’s order statistic leaves unspent.'
			: `Lower bound from the floor P₀ + P₁ − 1 ≤ F̃ (Cauchy–Schwarz): the two-basis matching sum’s own bound${o.perCell ? '; the cell limits need raw counts, so only the floor is used here' : '; the cell limits (at the error the floor leaves unspent) gave less'}.`,
		floorValue: floorModel.statistic(floorModel.means)
	};
}
