/**
 * A guaranteed upper bound on the largest eigenvalue of a real symmetric matrix (docs/statistics.md
 * §9). Power iteration gives a Rayleigh quotient θ ≤ λ_max; the bound is the smallest c = θ + s
 * (s = 10⁻⁹, 10⁻⁸, …) for which c·I − A has a Cholesky factor R̂ in floating point, plus that
 * factorisation's backward error: A_c + ΔA = R̂ᵀR̂ with |ΔA| ≤ γ_{n+1}|R̂ᵀ||R̂| (Demmel 1989;
 * Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed. (2002), Thm 10.3), so
 * λ_min(c·I − A) ≥ −γ_{n+1}‖R̂‖_F² and λ_max(A) ≤ c + γ_{n+1}‖R̂‖_F². If no shift up to 0.1 passes,
 * the Gershgorin bound (max row sum of |A|) is used instead. The power iteration finds the largest
 * eigenvalue of positive semidefinite matrices such as G; for others the bound stays valid, if loose.
 */

const UNIT_ROUNDOFF = 2 ** -53;

export interface EigenvalueBound {
	/** The Rayleigh quotient of the power iteration: a lower estimate. */
	estimate: number;
	/** A guaranteed upper bound (floating-point error included). */
	upper: number;
	method: 'cholesky-certified' | 'gershgorin';
}

function multiply(a: Float64Array, n: number, x: Float64Array, out: Float64Array): void {
	for (let i = 0; i < n; i++) {
		let s = 0;
		const row = i * n;
		for (let j = 0; j < n; j++) s += a[row + j] * x[j];
		out[i] = s;
	}
}

/** Rayleigh quotient after power iteration from a fixed, deterministic start vector. */
export function powerIteration(a: Float64Array, n: number, maxIterations = 2000): number {
	let x = Float64Array.from({ length: n }, (_, i) => 1 + 0.5 * Math.sin(1.7 * i + 0.3));
	let y = new Float64Array(n);
	let theta = -Infinity;
	for (let k = 0; k < maxIterations; k++) {
		let norm = 0;
		for (let i = 0; i < n; i++) norm += x[i] * x[i];
		norm = Math.sqrt(norm);
		if (norm === 0) return 0;
		for (let i = 0; i < n; i++) x[i] /= norm;
		multiply(a, n, x, y);
		let next = 0;
		for (let i = 0; i < n; i++) next += x[i] * y[i];
		const done = Math.abs(next - theta) <= 1e-15 * Math.max(1, Math.abs(next));
		theta = next;
		if (done) break;
		[x, y] = [y, x];
	}
	return theta;
}

/** ‖R̂‖_F² of the Cholesky factor of c·I − A, or null when a pivot is not positive. */
export function choleskyShifted(a: Float64Array, n: number, c: number): number | null {
	const r = new Float64Array(n * n);
	let frobenius = 0;
	for (let j = 0; j < n; j++) {
		for (let i = j; i < n; i++) {
			let s = (i === j ? c : 0) - a[i * n + j];
			for (let k = 0; k < j; k++) s -= r[i * n + k] * r[j * n + k];
			if (i === j) {
				if (!(s > 0)) return null;
				r[j * n + j] = Math.sqrt(s);
			} else r[i * n + j] = s / r[j * n + j];
			frobenius += r[i * n + j] * r[i * n + j];
		}
	}
	return frobenius;
}

export function gershgorin(a: Float64Array, n: number): number {
	let best = -Infinity;
	for (let i = 0; i < n; i++) {
		let s = 0;
		for (let j = 0; j < n; j++) s += Math.abs(a[i * n + j]);
		best = Math.max(best, s);
	}
	// Summing n terms: relative error at most n·u.
	return best * (1 + 2 * (n + 1) * UNIT_ROUNDOFF);
}

export function largestEigenvalueUpper(a: Float64Array, n: number): EigenvalueBound {
	const estimate = powerIteration(a, n);
	const gamma = ((n + 1) * UNIT_ROUNDOFF) / (1 - (n + 1) * UNIT_ROUNDOFF);
	const scale = Math.max(1, Math.abs(estimate));
	for (let s = 1e-9; s <= 0.1; s *= 10) {
		const c = estimate + s * scale;
		const frobenius = choleskyShifted(a, n, c);
		// Twice the backward-error term covers the rounding of the shift and of ‖R̂‖_F² itself.
		if (frobenius !== null)
			return { estimate, upper: c + 2 * gamma * frobenius, method: 'cholesky-certified' };
	}
	return { estimate, upper: gershgorin(a, n), method: 'gershgorin' };
}
