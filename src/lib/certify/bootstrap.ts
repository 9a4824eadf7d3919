/**
 * Seeded parametric Poisson bootstrap (witnesses.md §6). Replicate r draws every variable of
 * the model in index order from one Poisson source, r = 0, 1, …; the order is part of the
 * reproducibility contract.
 */
import type { PoissonModel } from './model';
import { PoissonSampler, prepareMeans } from './poisson';

export interface BootstrapOptions {
	resamples: number;
	seed: number;
	/** Called with the fraction done, about a hundred times per run. */
	onProgress?: (fraction: number) => void;
}

export function bootstrapReplicates(model: PoissonModel, options: BootstrapOptions): Float64Array {
	const sampler = new PoissonSampler(options.seed);
	const prepared = prepareMeans(model.means);
	const x = new Float64Array(model.means.length);
	const replicates = new Float64Array(options.resamples);
	const step = Math.max(1, Math.floor(options.resamples / 100));
	for (let r = 0; r < options.resamples; r++) {
		sampler.drawAll(prepared, x);
		replicates[r] = model.statistic(x);
		if (options.onProgress && (r + 1) % step === 0) options.onProgress((r + 1) / options.resamples);
	}
	return replicates;
}

/** The empirical q-quantile as the order statistic x_(⌈qB⌉) (inverse of the empirical CDF). */
export function empiricalQuantile(sorted: Float64Array, q: number): number {
	const rank = Math.ceil(q * sorted.length - 1e-9);
	return sorted[Math.min(sorted.length - 1, Math.max(0, rank - 1))];
}

/**
 * Conservative order statistics of B replicates for one-sided limits: below, x_(⌊q(B+1)⌋) (at
 * least x_(1)); above, x_(⌈q(B+1)⌉) (at most x_(B)). For a continuous distribution the expected
 * coverage of x_(k) is k/(B + 1), so these never spend more than the error q (common practice).
 */
export function lowerOrderStatistic(sorted: Float64Array, q: number): number {
	const rank = Math.floor(q * (sorted.length + 1) + 1e-9);
	return sorted[Math.min(sorted.length - 1, Math.max(0, rank - 1))];
}

export function upperOrderStatistic(sorted: Float64Array, q: number): number {
	const rank = Math.ceil(q * (sorted.length + 1) - 1e-9);
	return sorted[Math.min(sorted.length - 1, Math.max(0, rank - 1))];
}

export function standardDeviation(values: Float64Array): number {
	// Indexed loops: a typed array's iterator stays slow until V8 optimises it (the CLI's start).
	let mean = 0;
	for (let i = 0; i < values.length; i++) mean += values[i];
	mean /= values.length;
	let sum = 0;
	for (let i = 0; i < values.length; i++) sum += (values[i] - mean) * (values[i] - mean);
	return Math.sqrt(sum / Math.max(1, values.length - 1));
}
