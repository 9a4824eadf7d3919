/**
 * The test supermartingale M_n = Π (1 + λ_i (X_i − μ)) against "E[X_i | past] ≤ μ" (witnesses.md
 * §10), with the approximate growth-rate-adaptive (aGRAPA) bets of Waudby-Smith & Ramdas,
 * J. R. Stat. Soc. B 86, 1 (2024): λ_i from the trials before i only, capped at BET_CAP/μ.
 */

/** λ ≤ c/μ keeps every factor ≥ 1 − c > 0 (X ≥ 0), so one unlucky trial never zeroes M. */
export const BET_CAP = 0.5;
/** M is kept as mantissa × 10^scale: rescaled by 10^±STEP, never overflowing over 10⁸ trials. */
const STEP = 100;
const UP = 1e100;
const DOWN = 1e-100;

export interface BetPath {
	/** log₁₀ max_{n≥0} M_n (≥ 0, since M_0 = 1): the p-value is 10^−this. */
	log10Peak: number;
	/** log₁₀ M_N after the last trial. */
	log10Final: number;
	/** log₁₀ M_n at n = step, 2·step, …, N (the last point always), for plotting. */
	trace: Float64Array;
	traceStep: number;
}

/** Running state of one rung's M, kept as mantissa × 10^scale. */
class Wealth {
	m = 1;
	scale = 0;
	peak = 1;
	peakScale = 0;
	threshold = 1;
	constructor(
		readonly mu: number,
		readonly cap: number,
		readonly trace: Float64Array
	) {}
	rescale(): void {
		const up = this.m > UP;
		this.m *= up ? DOWN : UP;
		this.scale += up ? STEP : -STEP;
		this.threshold = this.peak * 10 ** (this.peakScale - this.scale);
	}
	path(traceStep: number): BetPath {
		return {
			log10Peak: Math.log10(this.peak) + this.peakScale,
			log10Final: Math.log10(this.m) + this.scale,
			trace: this.trace,
			traceStep
		};
	}
}

/**
 * Bets on X_i = values[codes[i]] ≥ 0 (at most xMax) against each mean in `mus`, in one pass: the
 * running mean and variance are shared, only μ differs. The priors (mean xMax/2, variance
 * xMax²/4, weight one trial) are those of the paper's bounded-[0, 1] setting, rescaled.
 */
export function betAgainstEach(
	codes: Uint16Array | Uint32Array,
	values: Float64Array,
	mus: number[],
	xMax: number,
	tracePoints = 0
): BetPath[] {
	const n = codes.length;
	const traceStep = tracePoints > 0 ? Math.max(1, Math.ceil(n / tracePoints)) : 0;
	const traceLength = traceStep ? Math.ceil(n / traceStep) : 0;
	const rungs = mus.map((mu) => new Wealth(mu, BET_CAP / mu, new Float64Array(traceLength)));
	let sum = xMax / 2;
	let squares = (xMax * xMax) / 4;
	let untilTrace = traceStep;
	for (let i = 0; i < n; i++) {
		const mean = sum / (i + 1);
		const variance = squares / (i + 1);
		const x = values[codes[i]];
		for (const w of rungs) {
			const gap = mean - w.mu;
			if (gap > 0) {
				const lambda = Math.min(gap / (variance + gap * gap), w.cap);
				w.m *= 1 + lambda * (x - w.mu);
				if (w.m > UP || w.m < DOWN) w.rescale();
				if (w.m > w.threshold) {
					w.peak = w.threshold = w.m;
					w.peakScale = w.scale;
				}
			}
		}
		sum += x;
		squares += (x - mean) * (x - mean);
		if (traceStep && (--untilTrace === 0 || i === n - 1)) {
			untilTrace = traceStep;
			const at = Math.ceil((i + 1) / traceStep) - 1;
			for (const w of rungs) w.trace[at] = Math.log10(w.m) + w.scale;
		}
	}
	return rungs.map((w) => w.path(traceStep));
}

/** One rung's path (the tests' entry). */
export function betAgainst(
	codes: Uint16Array | Uint32Array,
	values: Float64Array,
	mu: number,
	xMax: number,
	tracePoints = 0
): BetPath {
	return betAgainstEach(codes, values, [mu], xMax, tracePoints)[0];
}

/** p = min(1, 1/max M) as log₁₀ and as a number (0 once it underflows; log10P stays exact). */
export function pValue(path: BetPath): { p: number; log10P: number } {
	const log10P = path.log10Peak > 0 ? -path.log10Peak : 0; // never −0, which JSON would not keep
	return { p: 10 ** log10P, log10P };
}

/** Closed testing over nested nulls: SN ≥ k only when p_j ≤ α for every j < k. */
export function closedTestingRung(pValues: number[], alpha: number): number {
	let k = 1;
	while (k - 1 < pValues.length && pValues[k - 1] <= alpha) k++;
	return k;
}

/**
 * Trials (or blocks) a run at the observed rate needs for M to reach 1/α against mean μ: the
 * aGRAPA bet at the observed mean and variance, its growth g = mean ln(1 + λ(X − μ)) over the
 * data, and N = ln(1/α)/g. Null when the observed mean does not exceed μ.
 */
export function unitsNeeded(
	codes: Uint16Array | Uint32Array,
	values: Float64Array,
	mu: number,
	alpha: number
): number | null {
	const frequency = new Float64Array(values.length);
	for (let i = 0; i < codes.length; i++) frequency[codes[i]]++;
	const n = codes.length;
	let mean = 0;
	for (let v = 0; v < values.length; v++) mean += (frequency[v] * values[v]) / n;
	let variance = 0;
	for (let v = 0; v < values.length; v++) variance += (frequency[v] * (values[v] - mean) ** 2) / n;
	const gap = mean - mu;
	if (!(gap > 0)) return null;
	const lambda = Math.min(gap / (variance + gap * gap), BET_CAP / mu);
	let growth = 0;
	for (let v = 0; v < values.length; v++)
		if (frequency[v] > 0) growth += (frequency[v] / n) * Math.log1p(lambda * (values[v] - mu));
	return growth > 0 ? Math.ceil(Math.log(1 / alpha) / growth) : null;
}
