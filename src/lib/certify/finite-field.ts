/**
 * Arithmetic for the finite-field MUB constructions of witnesses.md §2:
 * GF(p^s) for odd p (Wootters & Fields, Ann. Phys. 191, 363 (1989)) and the
 * Galois ring GR(4, s) for p = 2 (Klappenecker & Rötteler, LNCS 2948 (2004)).
 * Elements are indexed by their coefficient digits in base p (digit i = coefficient of X^i).
 */

export interface PrimePower {
	prime: number;
	exponent: number;
}

/** `d = p^s` with p prime and s ≥ 1, or null when d is not a prime power. */
export function primePower(d: number): PrimePower | null {
	if (!Number.isInteger(d) || d < 2) return null;
	for (let p = 2; p * p <= d; p++) {
		if (d % p !== 0) continue;
		let rest = d;
		let exponent = 0;
		while (rest % p === 0) {
			rest /= p;
			exponent++;
		}
		return rest === 1 ? { prime: p, exponent } : null;
	}
	return { prime: d, exponent: 1 };
}

function digits(index: number, p: number, s: number): number[] {
	const out: number[] = [];
	for (let i = 0; i < s; i++) {
		out.push(index % p);
		index = Math.floor(index / p);
	}
	return out;
}

function fromDigits(coefficients: number[], p: number): number {
	return coefficients.reduceRight((acc, c) => acc * p + c, 0);
}

/** Product of two polynomials (coefficient arrays) reduced modulo the monic `modulus`, over Z_n. */
function mulMod(a: number[], b: number[], modulus: number[], n: number): number[] {
	const s = modulus.length - 1;
	const product = new Array<number>(2 * s - 1).fill(0);
	for (let i = 0; i < s; i++) {
		for (let j = 0; j < s; j++) product[i + j] = (product[i + j] + a[i] * b[j]) % n;
	}
	for (let k = product.length - 1; k >= s; k--) {
		const lead = product[k];
		if (lead === 0) continue;
		for (let i = 0; i <= s; i++) {
			product[k - s + i] = (((product[k - s + i] - lead * modulus[i]) % n) + n) % n;
		}
	}
	return product.slice(0, s);
}

function polyRemainderIsZero(f: number[], g: number[], p: number): boolean {
	const r = f.slice();
	const dg = g.length - 1;
	const inv = modularInverse(g[dg], p);
	for (let k = r.length - 1; k >= dg; k--) {
		const factor = (r[k] * inv) % p;
		if (factor === 0) continue;
		for (let i = 0; i <= dg; i++) r[k - dg + i] = (((r[k - dg + i] - factor * g[i]) % p) + p) % p;
	}
	return r.slice(0, dg).every((c) => c === 0);
}

function modularInverse(a: number, p: number): number {
	for (let x = 1; x < p; x++) if ((a * x) % p === 1) return x;
	throw new Error(`${a} has no inverse modulo ${p}`);
}

/** The first monic irreducible polynomial of degree s over GF(p), in index order (trial division). */
export function irreduciblePolynomial(p: number, s: number): number[] {
	for (let index = 0; index < p ** s; index++) {
		const candidate = [...digits(index, p, s), 1];
		let irreducible = true;
		for (let degree = 1; degree <= Math.floor(s / 2) && irreducible; degree++) {
			for (let g = 0; g < p ** degree; g++) {
				if (polyRemainderIsZero(candidate, [...digits(g, p, degree), 1], p)) {
					irreducible = false;
					break;
				}
			}
		}
		if (irreducible) return candidate;
	}
	throw new Error(`no irreducible polynomial of degree ${s} over GF(${p})`);
}

/**
 * Multiplication table and trace of a ring Z_n[X]/(f) with d = p^s elements indexed by
 * base-p digits. For n = p it is GF(p^s); for p = 2, n = 4 the table is kept for the
 * Teichmüller elements, which is what the Galois-ring construction needs.
 */
export interface FieldTables {
	prime: number;
	exponent: number;
	/** multiply[x * d + y] = index of x·y (for GR(4,s): of the Teichmüller lifts). */
	multiply: Int32Array;
	/** Phase exponent of the character: Tr(x) mod p for odd p. */
	trace: Int32Array;
}

/** Trace of the multiplication-by-x map: the field (or Galois-ring) trace of x. */
function traceOf(x: number[], f: number[], n: number): number {
	const s = f.length - 1;
	let total = 0;
	for (let i = 0; i < s; i++) {
		const unit = new Array<number>(s).fill(0);
		unit[i] = 1;
		total += mulMod(x, unit, f, n)[i];
	}
	return total % n;
}

export function galoisField(p: number, s: number): FieldTables {
	const d = p ** s;
	const f = irreduciblePolynomial(p, s);
	const elements = Array.from({ length: d }, (_, i) => digits(i, p, s));
	const multiply = new Int32Array(d * d);
	const trace = new Int32Array(d);
	for (let x = 0; x < d; x++) {
		trace[x] = traceOf(elements[x], f, p);
		for (let y = 0; y < d; y++)
			multiply[x * d + y] = fromDigits(mulMod(elements[x], elements[y], f, p), p);
	}
	return { prime: p, exponent: s, multiply, trace };
}

/**
 * Galois-ring traces for the MUBs in d = 2^s: entry a·d + x is Tr(τ_a·τ_x) mod 4, where τ_r is
 * the Teichmüller lift of the residue r ∈ GF(2^s). The trace is Z_4-linear, so the phase of
 * i^{Tr((a + 2b)·x)} is (table[a·d + x] + 2·table[b·d + x]) mod 4.
 */
export function galoisRingTraces(s: number): Int32Array {
	const d = 2 ** s;
	const f = irreduciblePolynomial(2, s);
	const one = [1, ...new Array<number>(s - 1).fill(0)];
	// Teichmüller representative of a residue r: r^(2^s) in GR(4, s).
	const teich = Array.from({ length: d }, (_, r) => {
		let result = one;
		const base = digits(r, 2, s);
		for (let k = 0; k < d; k++) result = mulMod(result, base, f, 4);
		return result;
	});
	const table = new Int32Array(d * d);
	for (let a = 0; a < d; a++) {
		for (let x = 0; x < d; x++) table[a * d + x] = traceOf(mulMod(teich[a], teich[x], f, 4), f, 4);
	}
	return table;
}
