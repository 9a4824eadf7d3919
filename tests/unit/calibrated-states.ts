/**
 * Test helpers for calibrated bases (witnesses.md §4.4), written independently of the engine:
 * perturbed bases (random complex noise, then modified Gram–Schmidt), and the correlation sum of a
 * pure state ψ = Σ_mn Ψ_mn |m n⟩ measured in bases a_t on side A and a_t* on side B:
 * ⟨a ⊗ a*|ψ⟩ = Σ_mn conj(a_m) a_n Ψ_mn = aᴴΨa.
 */
import type { CalibratedBasis } from '../../src/lib/certify/calibration';
import { basisVectors } from '../../src/lib/certify/bases';

export type Complex = [number, number];

/** A seeded uniform generator (mulberry32, common practice) so that failures reproduce. */
export { mulberry32 as uniforms } from '../../src/lib/certify/trials/simulate-trials';

export function exactBasis(
	d: number,
	t: number,
	fourier: 'cyclic' | 'field' = 'cyclic'
): CalibratedBasis {
	const b = basisVectors(d, t, fourier);
	return { basis: t, re: Float64Array.from(b.re), im: Float64Array.from(b.im) };
}

/** Adds noise of size `noise` to every component, then orthonormalises (modified Gram–Schmidt). */
export function perturbed(
	b: CalibratedBasis,
	d: number,
	noise: number,
	random: () => number
): CalibratedBasis {
	const re = Float64Array.from(b.re, (x) => x + noise * (2 * random() - 1));
	const im = Float64Array.from(b.im, (x) => x + noise * (2 * random() - 1));
	for (let j = 0; j < d; j++) {
		for (let k = 0; k < j; k++) {
			let pr = 0;
			let pi = 0;
			for (let m = 0; m < d; m++) {
				pr += re[k * d + m] * re[j * d + m] + im[k * d + m] * im[j * d + m];
				pi += re[k * d + m] * im[j * d + m] - im[k * d + m] * re[j * d + m];
			}
			for (let m = 0; m < d; m++) {
				re[j * d + m] -= pr * re[k * d + m] - pi * im[k * d + m];
				im[j * d + m] -= pr * im[k * d + m] + pi * re[k * d + m];
			}
		}
		let n = 0;
		for (let m = 0; m < d; m++) n += re[j * d + m] ** 2 + im[j * d + m] ** 2;
		n = Math.sqrt(n);
		for (let m = 0; m < d; m++) {
			re[j * d + m] /= n;
			im[j * d + m] /= n;
		}
	}
	return { basis: b.basis, re, im };
}

/** S = Σ_t Σ_a |aᴴΨa|² / ‖Ψ‖² for a coefficient matrix Ψ (re, im, row-major d × d). */
export function correlationSumOf(
	bases: CalibratedBasis[],
	d: number,
	psiRe: Float64Array,
	psiIm: Float64Array
): number {
	let norm = 0;
	for (let c = 0; c < d * d; c++) norm += psiRe[c] ** 2 + psiIm[c] ** 2;
	let s = 0;
	for (const b of bases)
		for (let a = 0; a < d; a++) {
			let re = 0;
			let im = 0;
			for (let m = 0; m < d; m++)
				for (let n = 0; n < d; n++) {
					// conj(a_m)·a_n·Ψ_mn
					const [xr, xi] = [b.re[a * d + m], -b.im[a * d + m]];
					const [yr, yi] = [b.re[a * d + n], b.im[a * d + n]];
					const [zr, zi] = [xr * yr - xi * yi, xr * yi + xi * yr];
					const [pr, pi] = [psiRe[m * d + n], psiIm[m * d + n]];
					re += zr * pr - zi * pi;
					im += zr * pi + zi * pr;
				}
			s += re * re + im * im;
		}
	return s / norm;
}

/** Ψ = U Vᵀ with U, V complex d × r: a state of Schmidt rank ≤ r (parameters: 4·d·r numbers). */
export function rankLimited(
	params: Float64Array,
	d: number,
	r: number
): [Float64Array, Float64Array] {
	const re = new Float64Array(d * d);
	const im = new Float64Array(d * d);
	const at = (k: number) => params[k];
	for (let m = 0; m < d; m++)
		for (let n = 0; n < d; n++)
			for (let i = 0; i < r; i++) {
				const [ur, ui] = [at(4 * (m * r + i)), at(4 * (m * r + i) + 1)];
				const [vr, vi] = [at(4 * (n * r + i) + 2), at(4 * (n * r + i) + 3)];
				re[m * d + n] += ur * vr - ui * vi;
				im[m * d + n] += ur * vi + ui * vr;
			}
	return [re, im];
}

/**
 * The largest S found over Schmidt rank ≤ r: random starts, then hill climbing with shrinking
 * steps. A search gives a lower estimate of the true maximum, never a threshold (§4.2 addendum).
 */
export function searchMaximum(
	bases: CalibratedBasis[],
	d: number,
	r: number,
	random: () => number,
	starts = 6,
	steps = 1500
): number {
	let best = -Infinity;
	const size = 4 * d * r;
	for (let s = 0; s < starts; s++) {
		let x = Float64Array.from({ length: size }, () => 2 * random() - 1);
		let value = correlationSumOf(bases, d, ...rankLimited(x, d, r));
		let step = 0.3;
		for (let k = 0; k < steps; k++) {
			const y = Float64Array.from(x, (v) => v + step * (2 * random() - 1));
			const next = correlationSumOf(bases, d, ...rankLimited(y, d, r));
			if (next > value) [x, value] = [y, next];
			else step = Math.max(1e-4, step * 0.995);
		}
		best = Math.max(best, value);
	}
	return best;
}
