/**
 * A lower confidence bound on F̃ of §4.3′ that holds for its TRUE value (docs/statistics.md §10):
 * F̃ grows with the tilted sum Σ_j p̃_j and falls with every off-diagonal computational cell, so
 * on the event that Σp̃ ≥ L_t and every cell ≤ u_c, F̃ ≥ F̃(u, L_t). Σp̃ = μ_tilt/μ_0 is a ratio of
 * Poisson means (tilted matching total over the computational pair total at equal time): given
 * their sum, the tilted count is binomial with p = R/(1 + R), so R ≥ p_L/(1 − p_L) from the exact
 * Clopper–Pearson limit p_L (the conditional method for a ratio of Poisson means, common practice).
 * Cells: Clopper–Pearson upper limits of N_c of T_0. Error α/2 for the ratio, α/(2·d(d − 1)) per
 * cell: by the union bound all hold with probability ≥ 1 − α.
 */
import { clopperPearsonLower, clopperPearsonUpper } from '../exact-limits';
import { targetFidelity } from './statistic';

export interface TargetData {
	/** The computational table's counts, row-major d × d. */
	computational: ArrayLike<number>;
	/** The d matching counts in the tilted vectors, same integration time as the table. */
	tilted: ArrayLike<number>;
}

function total(x: ArrayLike<number>): number {
	let s = 0;
	for (let i = 0; i < x.length; i++) s += x[i];
	return s;
}

export function targetPointValue(data: TargetData, lambda: Float64Array): number {
	const t0 = total(data.computational);
	return targetFidelity(data.computational, t0, total(data.tilted) / t0, lambda);
}

/** Lower bound on F̃ at error α (exact limits and the union bound; no simulation). */
export function targetLowerBound(data: TargetData, lambda: Float64Array, alpha: number): number {
	const d = lambda.length;
	const t0 = total(data.computational);
	const tilted = total(data.tilted);
	const p = clopperPearsonLower(tilted, tilted + t0, alpha / 2);
	const ratio = p / (1 - p);
	const cellAlpha = alpha / (2 * d * (d - 1));
	const cached = new Map<number, number>();
	const upper = new Float64Array(d * d);
	for (let c = 0; c < d * d; c++) {
		if (c % (d + 1) === 0) continue;
		const n = data.computational[c];
		if (!cached.has(n)) cached.set(n, clopperPearsonUpper(n, t0, cellAlpha));
		upper[c] = cached.get(n)!;
	}
	return targetFidelity(upper, 1, ratio, lambda);
}

/** Upper end: F̃ ≤ ((Σλ)²/d)·Σp̃ (the subtracted squares are ≥ 0), with Σp̃ at its upper limit. */
export function targetUpperBound(data: TargetData, lambda: Float64Array, alpha: number): number {
	const t0 = total(data.computational);
	const tilted = total(data.tilted);
	const p = clopperPearsonUpper(tilted, tilted + t0, alpha);
	const sum = lambda.reduce((s, x) => s + x, 0);
	return ((sum * sum) / lambda.length) * (p / (1 - p));
}
