/**
 * The test supermartingale M_n = Π (1 + λ_i (X_i − μ)) against "E[X_i | past] ≤ μ" (witnesses.md
 * §10), with the approximate growth-rate-adaptive (aGRAPA) bets of Waudby-Smith & Ramdas,
 * J. R. Stat. Soc. B 86, 1 (2024): λ_i from the trials before i only, capped at BET_CAP/μ.
 */
import { BLOCK, betBlock, Moments, Wealth } from './bet-blocks';

/** λ ≤ c/μ keeps every factor ≥ 1 − c > 0 (X ≥ 0), so one unlucky trial never zeroes M. */
export const BET_CAP = 0.5;

export interface BetPath {
	/** log₁₀ max_{n≥0} M_n (≥ 0, since M_0 = 1): the p-value is 10^−this. */
	log10Peak: number;
	/** log₁₀ M_N after the last trial. */
	log10Final: number;
	/** log₁₀ M_n at n = step, 2·step, …, N (the last point always), for plotting. */
	trace: Float64Array;
	traceStep: number;
}

/**
 * Bets on X_i = values[codes[i]] ≥ 0 (at most xMax) against each mean in `mus`, in one pass: the
 * running mean and variance are shared, only μ differs. The priors (mean xMax/2, variance
 * xMax²/4, weight one trial) are those of the paper's bounded-[0, 1] setting, rescaled. The pass
 * goes block by block (bet-blocks.ts), a block ending at every trace point.
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
	const rungs = mus.map(
		(mu) => new Wealth(mu, BET_CAP / mu, values, new Float64Array(traceLength))
	);
	const moments = new Moments(xMax);
	for (let from = 0; from < n;) {
		const nextTrace = traceStep ? (Math.floor(from / traceStep) + 1) * traceStep : n;
		const to = Math.min(from + BLOCK, n, nextTrace);
		moments.fill(codes, values, from, to);
		for (const w of rungs) betBlock(w, moments);
		if (traceStep && (to % traceStep === 0 || to === n))
			for (const w of rungs) w.trace[Math.ceil(to / traceStep) - 1] = Math.log10(w.m) + w.scale;
		from = to;
	}
	return rungs.map((w) => ({
		log10Peak: Math.log10(w.peak) + w.peakScale,
		log10Final: Math.log10(w.m) + w.scale,
		trace: w.trace,
		traceStep
	}));
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
