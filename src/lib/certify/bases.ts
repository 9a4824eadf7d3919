/**
 * Measurement bases by index (witnesses.md §2). Basis 0 is computational; basis 1 is the
 * Fourier basis of the group that labels the outcomes; bases 2..d complete a set of d + 1
 * mutually unbiased bases (MUBs) when d is a prime power.
 *
 * For prime d and for d that is not a prime power the label group is Z_d and basis 1 is
 * the cyclic Fourier basis d^{-1/2} Σ_m ω^{jm}|m⟩. For d = p^s with s ≥ 2 the cyclic Fourier
 * basis belongs to no known complete set, so basis 1 is the Fourier basis of the additive
 * group of GF(p^s), i.e. of (Z_p)^s with labels read as base-p digits; the fidelity method
 * uses the same group (see `labelDifference`).
 */
import { galoisField, galoisRingTraces, primePower, type FieldTables } from './finite-field';

/** A basis: `re[j * d + m]`, `im[j * d + m]` are the components ⟨m|j_t⟩ of vector j. */
export interface Basis {
	dimension: number;
	index: number;
	re: Float64Array;
	im: Float64Array;
}

export const MIN_DIMENSION = 2;
export const MAX_DIMENSION = 256;

/** Basis indices that exist in dimension d: 0..d for prime powers, else 0 and 1. */
export function availableBases(d: number): number[] {
	const count = primePower(d) ? d + 1 : 2;
	return Array.from({ length: count }, (_, t) => t);
}

export function basisExists(d: number, t: number): boolean {
	return Number.isInteger(t) && t >= 0 && t < availableBases(d).length;
}

/** (m − n) in the label group of basis 1: cyclic for non-prime-powers and primes, digit-wise otherwise. */
export function labelDifference(d: number): (m: number, n: number) => number {
	const pp = primePower(d);
	if (!pp || pp.exponent === 1) return (m, n) => (((m - n) % d) + d) % d;
	const { prime: p, exponent: s } = pp;
	return (m, n) => {
		let result = 0;
		let place = 1;
		for (let i = 0; i < s; i++) {
			const digit = ((((Math.floor(m / place) % p) - (Math.floor(n / place) % p)) % p) + p) % p;
			result += digit * place;
			place *= p;
		}
		return result;
	};
}

const fieldCache = new Map<number, FieldTables | Int32Array>();

function fieldFor(d: number): FieldTables | Int32Array {
	let tables = fieldCache.get(d);
	if (!tables) {
		const pp = primePower(d)!;
		tables = pp.prime === 2 ? galoisRingTraces(pp.exponent) : galoisField(pp.prime, pp.exponent);
		fieldCache.set(d, tables);
	}
	return tables;
}

/** Phase exponent k (in units of 2π/n) and n for component m of vector j of basis t ≥ 1. */
function phaseFunction(
	d: number,
	t: number
): { n: number; phase: (j: number, m: number) => number } {
	const pp = primePower(d);
	if (!pp) return { n: d, phase: (j, m) => (j * m) % d };
	const tables = fieldFor(d);
	const a = t - 1;
	if (tables instanceof Int32Array) {
		// Klappenecker–Rötteler: i^{Tr((a + 2b)·x)} over the Teichmüller set of GR(4, s).
		return { n: 4, phase: (j, m) => (tables[a * d + m] + 2 * tables[j * d + m]) % 4 };
	}
	// Wootters–Fields: ω_p^{Tr(a·x² + b·x)} over GF(p^s).
	const { multiply, trace, prime } = tables;
	return {
		n: prime,
		phase: (j, m) =>
			(trace[multiply[a * d + multiply[m * d + m]]] + trace[multiply[j * d + m]]) % prime
	};
}

const basisCache = new Map<string, Basis>();

export function basisVectors(d: number, t: number): Basis {
	if (!basisExists(d, t)) throw new RangeError(`basis ${t} does not exist in dimension ${d}`);
	const key = `${d}:${t}`;
	const cached = basisCache.get(key);
	if (cached) return cached;
	const re = new Float64Array(d * d);
	const im = new Float64Array(d * d);
	if (t === 0) {
		for (let j = 0; j < d; j++) re[j * d + j] = 1;
	} else {
		const { n, phase } = phaseFunction(d, t);
		const norm = 1 / Math.sqrt(d);
		for (let j = 0; j < d; j++) {
			for (let m = 0; m < d; m++) {
				const angle = (2 * Math.PI * phase(j, m)) / n;
				re[j * d + m] = norm * Math.cos(angle);
				im[j * d + m] = norm * Math.sin(angle);
			}
		}
	}
	const basis = { dimension: d, index: t, re, im };
	basisCache.set(key, basis);
	return basis;
}

/** Largest | |⟨i_s|j_t⟩|² − expected | over the given bases (1/d across bases, δ_ij within one). */
export function largestOverlapError(d: number, bases: number[]): number {
	const vectors = bases.map((t) => basisVectors(d, t));
	let worst = 0;
	for (let x = 0; x < vectors.length; x++) {
		for (let y = x; y < vectors.length; y++) {
			const u = vectors[x];
			const v = vectors[y];
			for (let i = 0; i < d; i++) {
				for (let j = 0; j < d; j++) {
					let re = 0;
					let im = 0;
					for (let m = 0; m < d; m++) {
						const a = i * d + m;
						const b = j * d + m;
						re += u.re[a] * v.re[b] + u.im[a] * v.im[b];
						im += u.re[a] * v.im[b] - u.im[a] * v.re[b];
					}
					const expected = x === y ? (i === j ? 1 : 0) : 1 / d;
					worst = Math.max(worst, Math.abs(re * re + im * im - expected));
				}
			}
		}
	}
	return worst;
}
