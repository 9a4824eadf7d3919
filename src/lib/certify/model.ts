/**
 * A statistic as a function of independent Poisson means: the observed counts (or sums of
 * counts) x_i, each modelled as Poisson with mean x_i (witnesses.md §6). The bootstrap draws
 * every x_i afresh and re-evaluates the statistic; the delta method uses the same function.
 */
export interface PoissonModel {
	/** Observed values of the Poisson variables, in draw order. */
	means: Float64Array;
	/** The statistic for values x (x may be a replicate; the function must not keep it). */
	statistic(x: Float64Array): number;
	/** ∂statistic/∂x_i at x, when the model knows it in closed form (else central differences). */
	gradient?(x: Float64Array): Float64Array;
}

/**
 * Delta-method standard error: sqrt(Σ (∂f/∂x_i)² x_i), with Poisson variance x_i and the
 * model's own partial derivatives or central differences (a zero mean has zero variance).
 */
export function deltaMethodStandardError(model: PoissonModel): number {
	if (model.gradient) {
		const slopes = model.gradient(model.means);
		return Math.sqrt(model.means.reduce((sum, mean, i) => sum + slopes[i] * slopes[i] * mean, 0));
	}
	const x = Float64Array.from(model.means);
	let variance = 0;
	for (let i = 0; i < x.length; i++) {
		const mean = model.means[i];
		if (mean <= 0) continue;
		const h = 1e-4 * mean;
		x[i] = mean + h;
		const up = model.statistic(x);
		x[i] = mean - h;
		const down = model.statistic(x);
		x[i] = mean;
		const slope = (up - down) / (2 * h);
		variance += slope * slope * mean;
	}
	return Math.sqrt(variance);
}
