/**
 * Measurement bases by index (witnesses.md §2), under one of two Fourier conventions.
 *
 * `cyclic` (the default; what most laboratories measure): basis 0 computational, basis 1 the
 * ℤ_d Fourier basis d^{-1/2} Σ_m ω^{jm}|m⟩ in every d; bases 2..d only for odd prime d
 * (Wootters–Fields quadratic phases) and basis 2 for d = 2.
 * `field` (prime powers d = p^s only): basis 1 is the Fourier basis of the additive group of
 * GF(p^s), i.e. of (ℤ_p)^s with labels read as base-p digits, and bases 2..d complete the
 * finite-field set of d + 1 MUBs. For prime d the two conventions give the same bases.
 * The fidelity method pairs cells in the convention's group (see `labelDifference`).
 */
import { galoisField, galoisRingTraces, primePower, type FieldTables } from './finite-field';

/** Which Fourier transform basis 1 is, and so which further bases exist. */
export const FOURIER_CONVENTIONS = ['cyclic', 'field'] as const;
export type FourierConvention = (typeof FOURIER_CONVENTIONS)[number];
export const DEFAULT_FOURIER: FourierConvention = 'cyclic';

export function isFourierConvention(value: unknown): value is FourierConvention {
	return value === 'cyclic' || value === 'field';
}

/** A basis: `re[j * d + m]`, `im[j * d + m]` are the components ⟨m|j_t⟩ of vector j. */
export interface Basis {
	dimension: number;
	index: number;
	re: Float64Array;
	im: Float64Array;
}

export const MIN_DIMENSION = 2;
export const MAX_DIMENSION = 1024;

/** True when d = p^s with s ≥ 2: the only dimensions where the two conventions differ. */
export function conventionsDiffer(d: number): boolean {
	const pp = primePower(d);
	return pp !== null && pp.exponent > 1;
}

/** Why the convention cannot be used in dimension d, or null when it can. */
export function fourierProblem(d: number, fourier: FourierConvention): string | null {
	if (fourier === 'field' && !primePower(d))
		return `fourier=field needs a prime-power dimension d = p^s (the field GF(p^s)); ${d} is not one — use fourier=cyclic`;
	return null;
}

/**
 * Basis indices that exist in dimension d under the convention: field → 0..d for prime powers;
 * cyclic → 0..d for prime d, else 0 and 1. An impossible convention (field, d = 6) has none.
 */
export function availableBases(d: number, fourier: FourierConvention = DEFAULT_FOURIER): number[] {
	return Array.from({ length: basisCount(d, fourier) }, (_, t) => t);
}

/** How many bases availableBases lists; no array, because the parsers ask once per row. */
function basisCount(d: number, fourier: FourierConvention): number {
	if (fourierProblem(d, fourier)) return 0;
	const pp = primePower(d);
	const complete = fourier === 'field' ? pp !== null : pp !== null && pp.exponent === 1;
	return complete ? d + 1 : 2;
}

export function basisExists(
	d: number,
	t: number,
	fourier: FourierConvention = DEFAULT_FOURIER
): boolean {
	return Number.isInteger(t) && t >= 0 && t < basisCount(d, fourier);
}

/** Basis t exists in dimension d under at least one convention (what a counts file may hold). */
export function basisExistsInAnyConvention(d: number, t: number): boolean {
	return FOURIER_CONVENTIONS.some((f) => basisExists(d, t, f));
}

/** Why basis t cannot be used in dimension d under the convention, or null when it can. */
export function basisProblem(d: number, t: number, fourier: FourierConvention): string | null {
	const problem = fourierProblem(d, fourier);
	if (problem) return problem;
	if (basisExists(d, t, fourier)) return null;
	if (fourier === 'cyclic' && basisExists(d, t, 'field'))
		return `basis ${t} in d = ${d} exists only with fourier=field (the GF(${d}) bases); the cyclic Fourier basis belongs to no known complete set there, so under fourier=cyclic only bases 0 and 1 exist`;
	return `basis ${t} does not exist in dimension ${d}`;
}

/**
 * How outcomes are named on charts: 0..d−1 under cyclic; under field in d = p^s, s ≥ 2 the
 * base-p digits of the field element (most significant first), e.g. "12" for 1·3 + 2 in d = 9.
 */
export function outcomeLabels(d: number, fourier: FourierConvention = DEFAULT_FOURIER): string[] {
	const pp = primePower(d);
	if (fourier === 'cyclic' || !pp || pp.exponent === 1)
		return Array.from({ length: d }, (_, m) => String(m));
	return Array.from({ length: d }, (_, m) =>
		m.toString(pp.prime).padStart(pp.exponent, '0').toUpperCase()
	);
}

/** (m − n) in the convention's label group: mod d for cyclic, digit-wise mod p for field. */
export function labelDifference(
	d: number,
	fourier: FourierConvention = DEFAULT_FOURIER
): (m: number, n: number) => number {
	const pp = primePower(d);
	if (fourier === 'cyclic' || !pp || pp.exponent === 1) return (m, n) => (((m - n) % d) + d) % d;
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
	t: number,
	fourier: FourierConvention
): { n: number; phase: (j: number, m: number) => number } {
	const pp = primePower(d);
	// Cyclic basis 1 in every d; for prime d the field formulas below are the cyclic ones too.
	if (!pp || (fourier === 'cyclic' && t === 1)) return { n: d, phase: (j, m) => (j * m) % d };
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

export function basisVectors(
	d: number,
	t: number,
	fourier: FourierConvention = DEFAULT_FOURIER
): Basis {
	const problem = basisProblem(d, t, fourier);
	if (problem) throw new RangeError(problem);
	const key = `${d}:${t}:${fourier}`;
	const cached = basisCache.get(key);
	if (cached) return cached;
	const re = new Float64Array(d * d);
	const im = new Float64Array(d * d);
	if (t === 0) {
		for (let j = 0; j < d; j++) re[j * d + j] = 1;
	} else {
		const { n, phase } = phaseFunction(d, t, fourier);
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
export function largestOverlapError(
	d: number,
	bases: number[],
	fourier: FourierConvention = DEFAULT_FOURIER
): number {
	const vectors = bases.map((t) => basisVectors(d, t, fourier));
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
