/**
 * What the planner simulates: a method, bases, and a model of the state as exact outcome tables —
 * white noise at visibility η (witnesses.md §7) or a finished check's own tables.
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import type { CountTable } from '../counts';
import { deltaMethodStandardError } from '../model';
import { witnessFamilies, type MethodId } from '../witnesses';
import type { PowerDesign } from './power';

/** ρ_η = η Φ_d + (1 − η) 𝟙/d² in mutually unbiased bases: p(a, b) = η δ_ab/d + (1 − η)/d². */
export function whiteNoiseTables(
	d: number,
	basisCount: number,
	visibility: number
): Float64Array[] {
	return Array.from({ length: basisCount }, () => {
		const p = new Float64Array(d * d).fill((1 - visibility) / (d * d));
		for (let a = 0; a < d; a++) p[a * d + a] += visibility / d;
		return p;
	});
}

/** A finished check's tables as the model: each basis normalised, weighted by its own total. */
export function observedModel(tables: CountTable[]): { model: Float64Array[]; weights: number[] } {
	const totals = tables.map((t) => t.counts.reduce((s, c) => s + c, 0));
	return {
		model: tables.map((t, i) => t.counts.map((c) => (totals[i] > 0 ? c / totals[i] : 0))),
		weights: totals
	};
}

/** The design's statistic at the model, the bound to clear and the plug-in SE at one count per weight. */
export function designMargin(design: PowerDesign): { value: number; bound: number; se1: number } {
	const family = witnessFamilies[design.method as MethodId];
	const { dimension: d, bases } = design;
	const bound = family.bounds(d, bases)[design.schmidtNumber - 2];
	const probe = 1e6;
	const tables = design.model.map((p, i) => ({
		basis: bases[i],
		counts: p.map((x) => x * probe * design.weights[i]),
		accidentals: null,
		durations: null,
		present: new Uint8Array(d * d).fill(1)
	}));
	const model = family.sufficientModel(tables, d, bases);
	return {
		value: family.statistic(design.model, d, bases),
		bound,
		se1: deltaMethodStandardError(model) * Math.sqrt(probe)
	};
}

/**
 * Where the search starts: the normal approximation with z_α + z_power (not z_α alone, which
 * gives about 50 % power). Only a starting point: the answer is the simulated one.
 */
export function normalGuess(design: PowerDesign, power: number): number | null {
	const { value, bound, se1 } = designMargin(design);
	if (!(value > bound) || !(se1 > 0)) return null;
	const z = normalQuantile(design.confidence, 0, 1) + normalQuantile(power, 0, 1);
	return ((z * se1) / (value - bound)) ** 2;
}

export type { MethodId };
