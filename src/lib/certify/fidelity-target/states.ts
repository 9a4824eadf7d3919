/**
 * Exact tables of ρ = v·|ψ_c⟩⟨ψ_c| + (1 − v)·𝟙/d², ψ_c = Σ_m c_m |mm⟩, for a fidelity-target
 * check (witnesses.md §4.3′): basis 0 the computational table, basis 1 the table in the tilted
 * vectors of λ per computational pair (same integration time, not normalised). For the planner and
 * the coverage benchmark; the boundary states are Φ_λ cut to its r largest coefficients.
 */
import type { TableState } from '../simulate-tables';
import { targetCoefficients } from './statistic';

/** |⟨ṽ_a ⊗ ṽ_b*|ψ_c⟩|² = |Σ_m c_m λ_m ω^{(b−a)m}|² / (Σλ)² (c real, λ with Σλ² = 1). */
function tiltedPure(c: number[], lambda: Float64Array, a: number, b: number): number {
	const d = c.length;
	const s = lambda.reduce((p, x) => p + x, 0);
	let [re, im] = [0, 0];
	for (let m = 0; m < d; m++) {
		const angle = (2 * Math.PI * (b - a) * m) / d;
		re += (c[m] * lambda[m] * Math.cos(angle)) / s;
		im += (c[m] * lambda[m] * Math.sin(angle)) / s;
	}
	return re * re + im * im;
}

/** v·|ψ_c⟩⟨ψ_c| + (1 − v)·𝟙/d²; table 1 is the tilted table per computational pair (not normalised). */
export function targetState(
	label: string,
	target: number[],
	coefficients: number[],
	v: number,
	schmidtNumber: number,
	isBound = false
): TableState {
	const d = target.length;
	const lambda = targetCoefficients(target, d);
	const norm = Math.hypot(...coefficients);
	const c = coefficients.map((x) => x / norm);
	const overlap = c.reduce((s, x, m) => s + x * lambda[m], 0);
	return {
		label,
		dimension: d,
		table(t) {
			const p = new Float64Array(d * d).fill((1 - v) / (d * d));
			for (let a = 0; a < d; a++)
				if (t === 0) p[a * d + a] += v * c[a] * c[a];
				else for (let b = 0; b < d; b++) p[a * d + b] += v * tiltedPure(c, lambda, a, b);
			return p;
		},
		schmidtNumber,
		schmidtNumberIsBound: isBound,
		fidelity: v * overlap * overlap + (1 - v) / (d * d)
	};
}

/** The truncation of Φ_λ to its r largest coefficients: SN = r, F = B_r (the boundary). */
export function truncatedTarget(target: number[], r: number): TableState {
	const c = target.map((x, m) => (m < r ? x : 0));
	return targetState(`Φλ cut to r=${r}, d=${target.length}`, target, c, 1, r);
}
