import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { availableBases, basisVectors } from '../../src/lib/certify/bases';
import {
	certify,
	expectedCounts,
	outcomeProbabilities,
	states,
	witnessFamilies
} from '../../src/lib/certify';
import { steeringBound } from '../../src/lib/certify/witnesses/steering-2mub';

const isotropicFidelity = (d: number, eta: number) => eta + (1 - eta) / (d * d);

describe('isotropic states with the complete MUB set (witnesses.md §8)', () => {
	// F(ρ_η, Φ_d) = η + (1 − η)/d² and SN(ρ_η) = ⌈d·F⌉ for F > 1/d:
	// Terhal & Horodecki, Phys. Rev. A 61, 040301(R) (2000).
	for (const d of [3, 5, 7]) {
		for (const eta of [0.15, 0.4, 0.55, 0.8, 0.97]) {
			const dF = d * isotropicFidelity(d, eta);
			if (dF <= 1 || Math.abs(dF - Math.round(dF)) < 0.02) continue;
			it(`d = ${d}, η = ${eta}: certifies exactly ⌈dF⌉ = ${Math.ceil(dF)} on noiseless counts`, () => {
				const data = expectedCounts(states.isotropic(d, eta), availableBases(d), 1e13);
				const result = certify(data, { method: 'mub-correlation', resamples: 1000 });
				// With all d + 1 bases S = 1 + d·F exactly (witnesses.md §4.1).
				expect(result.statistic.value).toBeCloseTo(1 + dF, 9);
				expect(result.certifiedSchmidtNumber).toBe(Math.ceil(dF));
			});
		}
	}

	it('where d·F is an integer r the strict inequality certifies no more than r', () => {
		const d = 5;
		const r = 3;
		const eta = (r / d - 1 / (d * d)) / (1 - 1 / (d * d));
		expect(d * isotropicFidelity(d, eta)).toBeCloseTo(r, 12);
		const data = expectedCounts(states.isotropic(d, eta), availableBases(d), 1e13);
		const result = certify(data, { method: 'mub-correlation', resamples: 1000 });
		expect([r - 1, r]).toContain(result.certifiedSchmidtNumber);
	});
});

describe('steering ladder (witnesses.md §4.2)', () => {
	it('β_1 = 1 + 1/√d is the largest eigenvalue of two rank-one projectors with overlap 1/d', () => {
		for (const d of [2, 3, 7, 31]) {
			// Independent check: eigenvalues by mathjs of |e_0⟩⟨e_0| + |f⟩⟨f| with |⟨e_0|f⟩|² = 1/d.
			const f = Array.from({ length: d }, () => 1 / Math.sqrt(d));
			const e0 = math.matrix(Array.from({ length: d }, (_, i) => [i === 0 ? 1 : 0]));
			const fColumn = math.matrix(f.map((x) => [x]));
			const sum = math.add(
				math.multiply(e0, math.transpose(e0)),
				math.multiply(fColumn, math.transpose(fColumn))
			) as math.Matrix;
			const values = (math.eigs(sum).values as math.Matrix).toArray() as number[];
			const largest = Math.max(...values);
			expect(steeringBound(1, d)).toBeCloseTo(1 + 1 / Math.sqrt(d), 14);
			expect(steeringBound(1, d)).toBeCloseTo(largest, 10);
		}
	});

	it('β_d = 2 and the ladder rises strictly', () => {
		for (const d of [2, 4, 7, 31, 127]) {
			expect(steeringBound(d, d)).toBeCloseTo(2, 14);
			const ladder = witnessFamilies['steering-2mub'].bounds(d, [0, 1]);
			expect(ladder).toHaveLength(d - 1);
			for (let i = 1; i < ladder.length; i++) expect(ladder[i]).toBeGreaterThan(ladder[i - 1]);
			expect(ladder[ladder.length - 1]).toBeLessThan(2);
		}
	});

	it('reports the steering-robustness lower bound SR ≥ W/(1 + 1/√d) − 1', () => {
		const d = 7;
		const result = certify(expectedCounts(states.isotropic(d, 0.9), [0, 1], 1e9), {
			method: 'steering-2mub',
			resamples: 500
		});
		const w = result.statistic.value;
		expect(result.steeringRobustness!.value).toBeCloseTo(w / (1 + 1 / Math.sqrt(d)) - 1, 12);
	});

	// Facts of the trade from the seed talk (common practice; no published source beside them).
	it('d = 31 with white noise: visibility 0.93 is enough to certify Schmidt number 15', () => {
		const result = certify(expectedCounts(states.isotropic(31, 0.93), [0, 1], 1e12), {
			method: 'steering-2mub',
			resamples: 1000
		});
		expect(result.certifiedSchmidtNumber).toBe(15);
		expect(result.bounds[13].criticalVisibility).toBeLessThan(0.93);
		expect(result.bounds[13].criticalVisibility).toBeGreaterThan(0.92);
	});

	it('d = 4: certifying Schmidt number 4 needs a visibility of roughly 0.93–0.95', () => {
		const ladder = certify(expectedCounts(states.isotropic(4, 0.99), [0, 1], 1e9), {
			method: 'steering-2mub',
			resamples: 500
		}).bounds;
		expect(ladder[2].criticalVisibility).toBeGreaterThan(0.93);
		expect(ladder[2].criticalVisibility).toBeLessThan(0.95);
	});
});

describe('MUB correlation bound is tight at Φ_r (witnesses.md §4.1)', () => {
	for (const [d, r] of [
		[5, 2],
		[7, 3],
		[6, 4]
	]) {
		it(`Φ_${r} in d = ${d} gives S = 1 + r/d on bases 0 and 1, exactly the bound B_${r}`, () => {
			const p = [0, 1].map((t) => outcomeProbabilities(states.rankLimited(d, r), t));
			const family = witnessFamilies['mub-correlation'];
			const s = family.statistic(p, d, [0, 1]);
			expect(s).toBeCloseTo(1 + r / d, 12);
			expect(s).toBeCloseTo(family.bounds(d, [0, 1])[r - 1], 12);
			const result = certify(expectedCounts(states.rankLimited(d, r), [0, 1], 1e12), {
				method: 'mub-correlation',
				resamples: 2000
			});
			expect(result.certifiedSchmidtNumber).toBeLessThanOrEqual(r);
		});
	}
});

/** A random density matrix on C^d ⊗ C^d: G G†/tr(G G†) with a seeded complex Ginibre G. */
function randomDensityMatrix(d: number, seed: number): math.Matrix {
	let state = seed;
	const uniform = () => ((state = (state * 1103515245 + 12345) % 2147483648) + 0.5) / 2147483648;
	const gauss = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
	const n = d * d;
	const g = math.matrix(
		Array.from({ length: n }, () => Array.from({ length: n }, () => math.complex(gauss(), gauss())))
	);
	const rho = math.multiply(g, math.ctranspose(g)) as math.Matrix;
	return math.divide(rho, math.trace(rho)) as math.Matrix;
}

function ket(d: number, t: number, j: number, conjugate: boolean): math.Matrix {
	const { re, im } = basisVectors(d, t);
	return math.matrix(
		Array.from({ length: d }, (_, m) => [
			math.complex(re[j * d + m], conjugate ? -im[j * d + m] : im[j * d + m])
		])
	);
}

function expectation(rho: math.Matrix, psi: math.Matrix): number {
	const value = (math.multiply(math.multiply(math.ctranspose(psi), rho), psi) as math.Matrix).get([
		0, 0
	]) as math.Complex | number;
	return typeof value === 'number' ? value : value.re;
}

describe('two-basis fidelity bound (witnesses.md §4.3)', () => {
	const family = witnessFamilies['fidelity-two-basis'];

	it('the product state |00⟩ gives F̃ = 1/d and Φ_d gives F̃ = 1', () => {
		for (const d of [2, 3, 4, 5, 6, 9]) {
			const product = [0, 1].map((t) => outcomeProbabilities(states.spectrum(d, [1]), t));
			expect(family.statistic(product, d, [0, 1])).toBeCloseTo(1 / d, 12);
			const maximal = [0, 1].map((t) => outcomeProbabilities(states.isotropic(d, 1), t));
			expect(family.statistic(maximal, d, [0, 1])).toBeCloseTo(1, 12);
		}
	});

	// F̃ never exceeds F = ⟨Φ_d|ρ|Φ_d⟩ (Cauchy–Schwarz argument of §4.3; Bavaresco et al.,
	// Nat. Phys. 14, 1032 (2018), from memory). ρ and the probabilities are computed with mathjs.
	for (const d of [2, 3, 4, 5, 6]) {
		it(`F̃ ≤ F on random two-qudit states, d = ${d}`, () => {
			const phi = math.divide(
				math.matrix(Array.from({ length: d * d }, (_, i) => [i % (d + 1) === 0 ? 1 : 0])),
				Math.sqrt(d)
			) as math.Matrix;
			const projector = math.multiply(phi, math.ctranspose(phi)) as math.Matrix;
			for (let seed = 1; seed <= 12; seed++) {
				// Mixed towards Φ_d so that F̃ comes close to F and a wrong Γ would show.
				const weight = [0, 0.5, 0.9, 0.99][seed % 4];
				const rho = math.add(
					math.multiply(projector, weight),
					math.multiply(randomDensityMatrix(d, seed * 7919), 1 - weight)
				) as math.Matrix;
				const p = [0, 1].map((t) => {
					const table = new Float64Array(d * d);
					for (let a = 0; a < d; a++)
						for (let b = 0; b < d; b++)
							table[a * d + b] = expectation(
								rho,
								math.kron(ket(d, t, a, false), ket(d, t, b, true)) as math.Matrix
							);
					return table;
				});
				const fidelity = expectation(rho, phi);
				expect(family.statistic(p, d, [0, 1])).toBeLessThanOrEqual(fidelity + 1e-12);
			}
		});
	}

	function permutations(items: number[]): number[][] {
		if (items.length <= 1) return [items];
		return items.flatMap((x, i) =>
			permutations([...items.slice(0, i), ...items.slice(i + 1)]).map((rest) => [x, ...rest])
		);
	}

	// Every permutation state d^{-1/2} Σ_m |m, π(m)⟩ has F = (fixed points of π / d)²; the bound must
	// hold for all of them, which checks the pairing of cells in Γ (same Cauchy–Schwarz argument).
	for (const d of [3, 4, 5]) {
		it(`F̃ ≤ F on every permutation state, d = ${d}`, () => {
			for (const pi of permutations(Array.from({ length: d }, (_, m) => m))) {
				const psi = math.matrix(
					Array.from({ length: d * d }, (_, i) => [
						pi[Math.floor(i / d)] === i % d ? 1 / Math.sqrt(d) : 0
					])
				);
				const rho = math.multiply(psi, math.ctranspose(psi)) as math.Matrix;
				const p = [0, 1].map((t) => {
					const table = new Float64Array(d * d);
					for (let a = 0; a < d; a++)
						for (let b = 0; b < d; b++)
							table[a * d + b] = expectation(
								rho,
								math.kron(ket(d, t, a, false), ket(d, t, b, true)) as math.Matrix
							);
					return table;
				});
				const fixed = pi.filter((x, m) => x === m).length;
				expect(family.statistic(p, d, [0, 1])).toBeLessThanOrEqual((fixed / d) ** 2 + 1e-12);
			}
		});
	}

	it('isotropic states certify ⌈d·F̃⌉ with F̃ = η + (1 − η)(2 − d)/d (derived from §4.3)', () => {
		const d = 7;
		const eta = 0.8;
		const tilde = eta + ((1 - eta) * (2 - d)) / d;
		const result = certify(expectedCounts(states.isotropic(d, eta), [0, 1], 1e12), {
			method: 'fidelity-two-basis',
			resamples: 1000
		});
		expect(result.statistic.plugInValue).toBeCloseTo(tilde, 9);
		// The reported value is the bound at confidence 1/2: at 10¹² counts within 1e-5 of F̃.
		expect(result.statistic.value).toBeCloseTo(tilde, 5);
		expect(result.certifiedSchmidtNumber).toBe(Math.ceil(d * tilde));
		expect(result.effectiveVisibility).toBeCloseTo(eta, 4);
	});
});
