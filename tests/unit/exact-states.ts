/**
 * Exact two-qudit states and their outcome tables, built with mathjs independently of the
 * engine's bases: basis 0 computational, basis 1 either the cyclic ℤ_d Fourier basis
 * d^{-1/2} Σ_m ω^{jm}|m⟩ or the Fourier basis of (ℤ_p)^s, d^{-1/2} Σ_m ω_p^{j·m}|m⟩ with j·m the
 * dot product of base-p digits (witnesses.md §2; common practice). Side B measures the conjugate
 * vectors (§1): p_t(a, b) = ⟨a_t, b_t*|ρ|a_t, b_t*⟩.
 */
import * as math from 'mathjs';

export type Convention = 'cyclic' | 'field';

function digitsOf(x: number, p: number, s: number): number[] {
	return Array.from({ length: s }, (_, i) => Math.floor(x / p ** i) % p);
}

/** Prime p and exponent s of d = p^s (the test dimensions only). */
export function primePowerOf(d: number): { p: number; s: number } {
	for (let p = 2; p <= d; p++) {
		if (d % p) continue;
		let s = 0;
		for (let r = d; r > 1; r /= p) s++;
		return { p, s };
	}
	throw new Error(`no prime factor of ${d}`);
}

/** Vector j of basis t as a column; `conj` gives its complex conjugate (what side B measures). */
export function ketOf(d: number, convention: Convention, t: 0 | 1, j: number, conj: boolean) {
	if (t === 0) return math.matrix(Array.from({ length: d }, (_, m) => [m === j ? 1 : 0]));
	const { p, s } = primePowerOf(d);
	const turn = (m: number) => {
		if (convention === 'cyclic') return (j * m) / d;
		const dj = digitsOf(j, p, s);
		const dm = digitsOf(m, p, s);
		return dj.reduce((acc, x, i) => acc + x * dm[i], 0) / p;
	};
	return math.matrix(
		Array.from({ length: d }, (_, m) => {
			const angle = 2 * Math.PI * turn(m) * (conj ? -1 : 1);
			return [math.complex(Math.cos(angle) / Math.sqrt(d), Math.sin(angle) / Math.sqrt(d))];
		})
	);
}

export function expectation(rho: math.Matrix, psi: math.Matrix): number {
	const value = (math.multiply(math.multiply(math.ctranspose(psi), rho), psi) as math.Matrix).get([
		0, 0
	]) as math.Complex | number;
	return typeof value === 'number' ? value : value.re;
}

/** |Φ_d⟩ = d^{-1/2} Σ_m |mm⟩ as a column. */
export function maximallyEntangled(d: number): math.Matrix {
	return math.matrix(
		Array.from({ length: d * d }, (_, i) => [i % (d + 1) === 0 ? 1 / Math.sqrt(d) : 0])
	);
}

/** A column vector as a density matrix |ψ⟩⟨ψ|. */
export const projector = (psi: math.Matrix) =>
	math.multiply(psi, math.ctranspose(psi)) as math.Matrix;

/** Seeded Gaussian column of n complex entries (an LCG: deterministic on every machine). */
function gaussianColumn(n: number, next: () => number): math.Matrix {
	const gauss = () => Math.sqrt(-2 * Math.log(next())) * Math.cos(2 * Math.PI * next());
	return math.matrix(Array.from({ length: n }, () => [math.complex(gauss(), gauss())]));
}

/**
 * ρ = w·Φ_d + (1 − w)·σ with σ a seeded random mixture of `rank` pure states: near Φ_d for w
 * close to 1, so that F̃ comes close to F and a wrong pairing of cells shows.
 */
export function stateNearPhi(d: number, seed: number, w: number, rank = 4): math.Matrix {
	let state = seed;
	const next = () => ((state = (state * 1103515245 + 12345) % 2147483648) + 0.5) / 2147483648;
	let sigma = math.zeros(d * d, d * d) as math.Matrix;
	for (let k = 0; k < rank; k++) sigma = math.add(sigma, projector(gaussianColumn(d * d, next)));
	sigma = math.divide(sigma, math.trace(sigma)) as math.Matrix;
	return math.add(
		math.multiply(projector(maximallyEntangled(d)), w),
		math.multiply(sigma, 1 - w)
	) as math.Matrix;
}

/** p_0 and p_1 of ρ, cell a·d + b, in the given convention. */
export function exactTables(rho: math.Matrix, d: number, convention: Convention): Float64Array[] {
	return ([0, 1] as const).map((t) => {
		const a = Array.from({ length: d }, (_, j) => ketOf(d, convention, t, j, false));
		const b = Array.from({ length: d }, (_, j) => ketOf(d, convention, t, j, true));
		const table = new Float64Array(d * d);
		for (let x = 0; x < d; x++)
			for (let y = 0; y < d; y++)
				table[x * d + y] = expectation(rho, math.kron(a[x], b[y]) as math.Matrix);
		return table;
	});
}

/**
 * The published bound written out directly (Bavaresco et al., Nat. Phys. 14, 1032 (2018)):
 * F̃ = (1/d)[Σ_m p_0(m,m) + d·Σ_j p_1(j,j) − 1 − Γ],
 * Γ = Σ_{δ≠0}[(Σ_m √p_0(m, m−δ))² − Σ_m p_0(m, m−δ)], with m − δ in the convention's group.
 */
export function directFidelityBound(p: Float64Array[], d: number, convention: Convention): number {
	const { p: prime, s } = primePowerOf(d);
	const minus = (m: number, delta: number) => {
		if (convention === 'cyclic') return (((m - delta) % d) + d) % d;
		const dm = digitsOf(m, prime, s);
		const dd = digitsOf(delta, prime, s);
		return dm.reduce(
			(acc, x, i) => acc + ((((x - dd[i]) % prime) + prime) % prime) * prime ** i,
			0
		);
	};
	let diagonal = 0;
	let fourier = 0;
	for (let m = 0; m < d; m++) diagonal += p[0][m * d + m];
	for (let j = 0; j < d; j++) fourier += p[1][j * d + j];
	let gamma = 0;
	for (let delta = 1; delta < d; delta++) {
		let root = 0;
		let plain = 0;
		for (let m = 0; m < d; m++) {
			const q = p[0][m * d + minus(m, delta)];
			root += Math.sqrt(Math.max(0, q));
			plain += q;
		}
		gamma += root * root - plain;
	}
	return (diagonal + d * fourier - 1 - gamma) / d;
}

/** A dataset-shaped JSON counts file (product.md) of the tables scaled to `total` pairs per basis. */
export function countsJson(p: Float64Array[], d: number, total: number, fourier?: Convention) {
	const tables = p.map((table, basis) => ({
		basis,
		counts: Array.from({ length: d }, (_, a) =>
			Array.from({ length: d }, (_, b) => Math.round(Math.max(0, table[a * d + b]) * total))
		)
	}));
	return JSON.stringify(fourier ? { dimension: d, fourier, tables } : { dimension: d, tables });
}

/**
 * A seeded pure state on a few random cells |m n⟩ with eighth-root phases: the kind of state on
 * which pairing cells in the wrong group breaks F̃ ≤ F (found by search; any seed is valid).
 */
export function sparseState(d: number, seed: number): math.Matrix {
	let state = seed;
	const next = () => ((state = (state * 1103515245 + 12345) % 2147483648) + 0.5) / 2147483648;
	const cells = new Map<number, number>();
	const k = 2 + Math.floor(next() * d);
	for (let i = 0; i < k; i++) cells.set(Math.floor(next() * d * d), Math.floor(next() * 8));
	const norm = Math.sqrt(cells.size);
	return math.matrix(
		Array.from({ length: d * d }, (_, i) => {
			const turn = cells.get(i);
			if (turn === undefined) return [0];
			const angle = (2 * Math.PI * turn) / 8;
			return [math.complex(Math.cos(angle) / norm, Math.sin(angle) / norm)];
		})
	);
}

/** p_t(a, b) = |⟨a_t, b_t*|ψ⟩|² of a pure state (the same tables as exactTables on |ψ⟩⟨ψ|, faster). */
export function pureTables(psi: math.Matrix, d: number, convention: Convention): Float64Array[] {
	return ([0, 1] as const).map((t) => {
		const a = Array.from({ length: d }, (_, j) => ketOf(d, convention, t, j, false));
		const b = Array.from({ length: d }, (_, j) => ketOf(d, convention, t, j, true));
		const table = new Float64Array(d * d);
		for (let x = 0; x < d; x++)
			for (let y = 0; y < d; y++) {
				const v = math.kron(a[x], b[y]) as math.Matrix;
				const amp = (math.multiply(math.ctranspose(v), psi) as math.Matrix).get([0, 0]);
				table[x * d + y] = (math.abs(amp) as number) ** 2;
			}
		return table;
	});
}
