/**
 * The statistic, its lower confidence bound and its 95 % interval (docs/statistics.md).
 * Correlation sums: the convolved confidence distributions of S (raw counts) or draws (per cell).
 * Fidelity: the bound at confidence 1/2 is reported (the plug-in F̃ beside it), and its lower bound
 * is the better of the floor P_0 + P_1 − 1 and the exact cell limits, which share the error.
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
import { fidelityCellCeiling, fidelityCellLimits } from './fidelity-limits';
import { deltaMethodStandardError, type PoissonModel } from './model';
import { exactSumBound, sumTerms } from './sum-bound';
import { sumLowerQuantile, sumStandardDeviation, sumUpperQuantile } from './sum-quantile';
import { matchingSum } from './witnesses/correlation-sum';
import type { FourierConvention } from './bases';
import type { WitnessFamily } from './witnesses';

export type BoundMethod =
	'beta-convolution-sum' | 'garwood-cells-sum' | 'fidelity-floor' | 'fidelity-cell-limits';

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
	const common = {
		value: model.statistic(model.means),
		deltaMethodStandardError: deltaMethodStandardError(model)
	};
	if (!o.perCell)
		return {
			...common,
			...exactSumBound(o.tables, o.d, o.confidence),
			boundMethod: 'beta-convolution-sum',
			boundNote:
				'Lower bound from the convolution of each basis’s Beta confidence distribution (exact, Clopper–Pearson, for one basis; one continuity correction shared by all bases), computed on a grid rounded to the safe side: no resampling, so the resamples setting is not used.'
		};
	const reps = replicatesOf(o, false);
	const [lower, upper] = [sorted(reps.lower), sorted(reps.upper)];
	return {
		...common,
		standardError: standardDeviation(reps.lower),
		lower: below(lower, 1 - o.confidence),
		interval95: [below(lower, 0.025), above(upper, 0.975)],
		boundMethod: 'garwood-cells-sum',
		boundNote:
			'Lower bound from exact (Garwood) confidence-distribution draws of every cell, matching cells low and the others high; accidental estimates, where subtracted, are taken as exact.'
	};
}

/** Whether the bound is read off Monte-Carlo replicates: per cell only (raw counts are convolved). */
export function usesReplicates(o: Pick<BoundInputs, 'perCell'>): boolean {
	return o.perCell;
}

/** The floor P₀ + P₁ − 1 at error q and the upper end of P₀ + d·P₁, from replicates or exactly. */
function floorQuantiles(o: BoundInputs) {
	const { d } = o;
	if (!o.perCell) {
		const floor = sumTerms(o.tables, d);
		const upper = sumTerms(o.tables, d, [1, d]).upper;
		// Two terms: each quantile is a short direct convolution.
		return {
			floorAt: (q: number) => sumLowerQuantile(floor.lower, q) - 1,
			upper975: sumUpperQuantile(upper, 0.975),
			standardError: sumStandardDeviation(floor.lower)
		};
	}
	const reps = replicatesOf(o, true);
	const [lower, upper] = [sorted(reps.lower), sorted(reps.upper)];
	return {
		floorAt: (q: number) => below(lower, q) - 1,
		upper975: above(upper, 0.975),
		standardError: standardDeviation(reps.lower)
	};
}

/**
 * The cell limits' share of the error where they can be used (raw counts); the floor, the two-basis
 * sum's own bound, takes the rest (docs/statistics.md §2, §14). The floor certifies a rung that the
 * sum at the full α certifies only if the sum's bound misses it by the sliver between its error-α
 * and error-(1 − s)α quantiles; exact limits widen only with the logarithm of their error, so a
 * share this small still lets the cells win where Γ is far below its ceiling (cross-talk, d = 4,
 * confidence 0.99865: from about 7·10³ counts per basis, against 4·10³ at a share of 1/8).
 */
export const CELL_SHARE = 2 ** -16;

/**
 * The share at these totals, fixed before any count is read. Given the totals the counts are
 * multinomial, so the totals say nothing about the cell probabilities: a share that depends on them
 * alone keeps the union bound's level, given the totals and therefore overall. Where even the cell
 * limits' ceiling at these totals (every count matching) does not clear the first rung 1/d, the
 * cells can never certify anything; the floor then takes the whole error and the method certifies
 * exactly what `mub-correlation` certifies on bases 0 and 1.
 */
export function cellShare(
	o: Pick<BoundInputs, 'perCell' | 'confidence' | 'tables' | 'd'>,
	statistic: (p: Float64Array[]) => number
): number {
	if (o.perCell) return 0;
	const cellError = (1 - o.confidence) * CELL_SHARE;
	return fidelityCellCeiling(o.tables, o.d, cellError, statistic) > 1 / o.d ? CELL_SHARE : 0;
}

function fidelityBoundNote(perCell: boolean, share: number, byCells: boolean): string {
	// No locale formatting: the note is part of the result that every verifier compares bit for bit.
	const cellsShare = `1/${1 / CELL_SHARE}`;
	if (byCells)
		return `Lower bound from exact per-cell limits: Clopper–Pearson limits on both matching fractions and on every off-diagonal computational cell, combined by the union bound at ${cellsShare} of the error (the floor took the rest).`;
	const floor =
		'Lower bound from the floor P₀ + P₁ − 1 ≤ F̃ (Cauchy–Schwarz): the two-basis matching sum’s bound';
	if (perCell)
		return `${floor} at the full error; the cell limits need raw counts, so only the floor is used here.`;
	if (share === 0)
		return `${floor} at the full error, the same bound as mub-correlation on bases 0 and 1: at these totals the cell limits could not clear the first rung even with every count matching, so they were not used.`;
	return `${floor} at all but ${cellsShare} of the error; the cell limits (${cellsShare} of the error) gave less.`;
}

export function fidelityBound(o: BoundInputs): StatisticBound {
	const { d } = o;
	const alpha = 1 - o.confidence;
	const fidelity = (p: Float64Array[]) => o.family.statistic(p, d, o.bases, o.fourier);
	const model = pointModel(o, fidelity);
	const floor = floorQuantiles(o);
	const share = cellShare(o, fidelity);
	const cells = (error: number) =>
		share === 0 || !(error > 0) ? -Infinity : fidelityCellLimits(o.tables, d, error, fidelity);
	// At error q: the floor at q·(1 − share), the cell limits at q·share (the union bound totals q);
	// without raw counts, or where the cells cannot certify, the floor takes all of q.
	const at = (q: number) => ({ floor: floor.floorAt(q * (1 - share)), cells: cells(q * share) });
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
		standardError: floor.standardError,
		lower: Math.max(bound.floor, bound.cells),
		interval95: [Math.max(low95.floor, low95.cells), (floor.upper975 - 1) / d],
		deltaMethodStandardError: deltaMethodStandardError(model),
		boundMethod: byCells ? 'fidelity-cell-limits' : 'fidelity-floor',
		boundNote: fidelityBoundNote(o.perCell, share, byCells),
		floorValue: floorModel.statistic(floorModel.means)
	};
}
