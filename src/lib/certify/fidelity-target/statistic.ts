/**
 * Fidelity with a non-maximally entangled target Φ_λ = Σ_m λ_m |mm⟩ (witnesses.md §4.3′):
 *   F̃ = ((Σλ)²/d)·Σ_j p̃_j − Σ_{δ=1}^{d−1} (Σ_m √(λ_m λ_{m−δ} p₀(m, m−δ)))²   (m − δ mod d),
 * p̃_j the matching count in the tilted vectors ṽ_j = (Σλ)^{-1/2} Σ_m ω^{jm} √λ_m |m⟩ (side B: ṽ_j*)
 * divided by the pair total of the computational table at equal integration time — never by the
 * tilted counts themselves (that over-certifies, §4.3′). F̃ ≤ F(ρ, Φ_λ) and SN ≤ r ⇒ F ≤ Σ_{i≤r} λ_i²
 * (Bavaresco et al., Nat. Phys. 14, 1032 (2018)).
 */
import { InputError } from '../counts';

/** λ as declared: d positive numbers, not increasing; returned scaled to Σλ² = 1. */
export function targetCoefficients(lambda: number[], d: number): Float64Array {
	if (lambda.length !== d)
		throw new InputError(`target: expected ${d} Schmidt coefficients, got ${lambda.length}`);
	lambda.forEach((x, i) => {
		if (!(Number.isFinite(x) && x > 0))
			throw new InputError(`target[${i}]: expected a positive number, got ${x}`);
		if (i > 0 && x > lambda[i - 1])
			throw new InputError(
				`target[${i}]: the coefficients must not increase (${lambda[i - 1]} then ${x})`
			);
	});
	const norm = Math.sqrt(lambda.reduce((s, x) => s + x * x, 0));
	return Float64Array.from(lambda, (x) => x / norm);
}

/** The ladder Σ_{i≤r} λ_i² for r = 1 … d − 1. */
export function targetBounds(lambda: Float64Array): number[] {
	const out: number[] = [];
	let s = 0;
	for (let r = 0; r < lambda.length - 1; r++) out.push((s += lambda[r] * lambda[r]));
	return out;
}

/**
 * F̃ from the computational weights w0 (row-major d × d; any scale t0 = their pair total) and the
 * tilted matching sum Σ_j p̃_j (already divided by t0).
 */
export function targetFidelity(
	w0: ArrayLike<number>,
	t0: number,
	tiltedSum: number,
	lambda: Float64Array
): number {
	const d = lambda.length;
	const sum = lambda.reduce((s, x) => s + x, 0);
	let subtracted = 0;
	for (let delta = 1; delta < d; delta++) {
		let inner = 0;
		for (let m = 0; m < d; m++) {
			const n = (m - delta + d) % d;
			inner += Math.sqrt((lambda[m] * lambda[n] * w0[m * d + n]) / t0);
		}
		subtracted += inner * inner;
	}
	return ((sum * sum) / d) * tiltedSum - subtracted;
}

/** F̃ of white noise 𝟙/d² (ṽ_j are unit vectors): the statistic is v + (1 − v)·this on vΦ_λ + white. */
export function whiteNoiseValue(lambda: Float64Array): number {
	const d = lambda.length;
	const w0 = new Float64Array(d * d).fill(1 / (d * d));
	return targetFidelity(w0, 1, 1 / d, lambda);
}
