/**
 * Overlaps of calibrated bases: the orthonormality check within ε and the matrices
 * D^{ts}_{ab} = |⟨a_t|b_s⟩|² of witnesses.md §4.4.
 */
import { InputError } from '../counts';
import type { CalibratedBasis } from './calibration-file';

/** Rounding of the file's decimal digits: orthonormality is never asked finer than this. */
export const ORTHONORMALITY_FLOOR = 1e-9;

/** ⟨a_s|b_t⟩ = Σ_m conj(a_m)·b_m as [re, im]. */
export function innerProduct(
	s: CalibratedBasis,
	a: number,
	t: CalibratedBasis,
	b: number,
	d: number
): [number, number] {
	let re = 0;
	let im = 0;
	for (let m = 0; m < d; m++) {
		const [ar, ai] = [s.re[a * d + m], s.im[a * d + m]];
		const [br, bi] = [t.re[b * d + m], t.im[b * d + m]];
		re += ar * br + ai * bi;
		im += ar * bi - ai * br;
	}
	return [re, im];
}

/** D_ab = |⟨a_s|b_t⟩|², row-major d × d. */
export function overlapMatrix(s: CalibratedBasis, t: CalibratedBasis, d: number): Float64Array {
	const out = new Float64Array(d * d);
	for (let a = 0; a < d; a++)
		for (let b = 0; b < d; b++) {
			const [re, im] = innerProduct(s, a, t, b, d);
			out[a * d + b] = re * re + im * im;
		}
	return out;
}

/** Refuses a basis whose vectors are not orthonormal within ε: |⟨a|b⟩ − δ_ab| ≤ max(ε, 10⁻⁹). */
export function checkOrthonormal(basis: CalibratedBasis, d: number, tolerance: number): void {
	const allowed = Math.max(tolerance, ORTHONORMALITY_FLOOR);
	for (let a = 0; a < d; a++)
		for (let b = a; b < d; b++) {
			const [re, im] = innerProduct(basis, a, basis, b, d);
			const off = Math.hypot(re - (a === b ? 1 : 0), im);
			if (off > allowed) {
				const what =
					a === b
						? `vector ${a} has squared norm ${re.toFixed(6)}`
						: `vectors ${a} and ${b} overlap by ${Math.hypot(re, im).toExponential(2)}`;
				throw new InputError(
					`calibration basis ${basis.basis}: not orthonormal within the tolerance ${allowed}: ${what}`
				);
			}
		}
}

/** max over pairs of bases and outcomes of |d·|⟨a_t|b_s⟩|² − 1|: how far from unbiased they are. */
export function largestBias(bases: CalibratedBasis[], d: number): number {
	let worst = 0;
	for (let i = 0; i < bases.length; i++)
		for (let k = i + 1; k < bases.length; k++)
			for (const x of overlapMatrix(bases[i], bases[k], d))
				worst = Math.max(worst, Math.abs(d * x - 1));
	return worst;
}

/**
 * For the refusal test of physical.ts in calibrated bases: P_s(j) + P_t(l) ≤ 1 + |⟨j_s|l_t⟩| for
 * any state, and |⟨j_s|l_t⟩|² ≤ D̂_jl + ε (the conjugate bases of side B have the same overlaps).
 */
export function calibratedPairLimit(bases: CalibratedBasis[], d: number, tolerance: number) {
	const overlaps = new Map<string, Float64Array>();
	return (i: number, k: number, j: number, l: number): number => {
		const key = `${i}:${k}`;
		if (!overlaps.has(key)) overlaps.set(key, overlapMatrix(bases[i], bases[k], d));
		return 1 + Math.sqrt(Math.min(1, overlaps.get(key)![j * d + l] + tolerance));
	};
}
