/**
 * Fidelity with a non-maximally entangled target (witnesses.md §4.3′): check values of the
 * contract, F̃ ≤ F on random states, the over-certification the contract warns of, and the
 * coverage of the exact lower bound. Outcome probabilities are computed here from the state,
 * independently of the engine: p₀(m, n) = ⟨mn|ρ|mn⟩, q_j = ⟨ṽ_j ṽ_j*|ρ|ṽ_j ṽ_j*⟩.
 */
import { describe, expect, it } from 'vitest';
import { witnessFamilies } from '../../src/lib/certify';
import {
	targetBounds,
	targetCoefficients,
	targetFidelity,
	targetLowerBound,
	targetPointValue,
	whiteNoiseValue
} from '../../src/lib/certify/fidelity-target';
import { poissonSource } from '../../src/lib/certify/poisson';
import { uniforms } from './calibrated-states';

type C = [number, number];
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const conj = (a: C): C => [a[0], -a[1]];

/** ṽ_j,m = (Σλ)^{-1/2} ω^{jm} √λ_m. */
function tilted(lambda: Float64Array): C[][] {
	const d = lambda.length;
	const s = lambda.reduce((a, x) => a + x, 0);
	return Array.from({ length: d }, (_, j) =>
		Array.from({ length: d }, (_, m) => {
			const angle = (2 * Math.PI * j * m) / d;
			const r = Math.sqrt(lambda[m] / s);
			return [r * Math.cos(angle), r * Math.sin(angle)] as C;
		})
	);
}

/** Exact data of a pure state Ψ (d × d coefficients, normalised here): p₀, q, and F = |Σ λ_m Ψ_mm|². */
function pureData(psi: C[][], lambda: Float64Array) {
	const d = lambda.length;
	let norm = 0;
	for (const row of psi) for (const z of row) norm += z[0] ** 2 + z[1] ** 2;
	const p0 = new Float64Array(d * d);
	for (let m = 0; m < d; m++)
		for (let n = 0; n < d; n++) p0[m * d + n] = (psi[m][n][0] ** 2 + psi[m][n][1] ** 2) / norm;
	const q = tilted(lambda).map((v) => {
		let amp: C = [0, 0];
		for (let m = 0; m < d; m++)
			for (let n = 0; n < d; n++) {
				const z = mul(mul(conj(v[m]), v[n]), psi[m][n]);
				amp = [amp[0] + z[0], amp[1] + z[1]];
			}
		return (amp[0] ** 2 + amp[1] ** 2) / norm;
	});
	let overlap: C = [0, 0];
	for (let m = 0; m < d; m++)
		overlap = [overlap[0] + lambda[m] * psi[m][m][0], overlap[1] + lambda[m] * psi[m][m][1]];
	return { p0, q, fidelity: (overlap[0] ** 2 + overlap[1] ** 2) / norm };
}

const targetState = (lambda: Float64Array): C[][] =>
	Array.from({ length: lambda.length }, (_, m) =>
		Array.from({ length: lambda.length }, (_, n) => (m === n ? [lambda[m], 0] : [0, 0]) as C)
	);
const sum = (x: ArrayLike<number>) => Array.from(x).reduce((a, b) => a + b, 0);
const statOf = (data: { p0: Float64Array; q: number[] }, lambda: Float64Array) =>
	targetFidelity(data.p0, 1, sum(data.q), lambda);

describe('check values of witnesses.md §4.3′', () => {
	const lambda = targetCoefficients([0.863, 0.485, 0.143], 3);

	it('|00⟩ gives F̃ = F = λ₀²', () => {
		const state = targetState(lambda).map((row, m) =>
			row.map((_, n) => (m === 0 && n === 0 ? [1, 0] : [0, 0]) as C)
		);
		const data = pureData(state, lambda);
		expect(statOf(data, lambda)).toBeCloseTo(lambda[0] ** 2, 12);
		expect(data.fidelity).toBeCloseTo(lambda[0] ** 2, 12);
	});

	it('Φ_λ gives 1', () => {
		expect(statOf(pureData(targetState(lambda), lambda), lambda)).toBeCloseTo(1, 12);
	});

	it('uniform λ gives §4.3’s F̃ (the engine’s fidelity-two-basis statistic)', () => {
		const d = 4;
		const uniform = targetCoefficients([1, 1, 1, 1], d);
		const random = uniforms(3);
		const psi = Array.from({ length: d }, () =>
			Array.from({ length: d }, () => [random() - 0.5, random() - 0.5] as C)
		);
		const data = pureData(psi, uniform);
		const p1 = new Float64Array(d * d);
		data.q.forEach((x, j) => (p1[j * d + j] = x));
		const twoBasis = witnessFamilies['fidelity-two-basis'].statistic(
			[data.p0, p1],
			d,
			[0, 1],
			'cyclic'
		);
		expect(statOf(data, uniform)).toBeCloseTo(twoBasis, 12);
	});

	it('vΦ_λ + (1 − v)𝟙/d² (d = 3, λ ∝ (.863, .485, .143), v = 0.9) gives 0.8893355', () => {
		const v = 0.9;
		const pure = pureData(targetState(lambda), lambda);
		const p0 = Float64Array.from(pure.p0, (x) => v * x + (1 - v) / 9);
		const q = pure.q.map((x) => v * x + (1 - v) / 9); // ṽ_j are unit vectors
		expect(targetFidelity(p0, 1, sum(q), lambda)).toBeCloseTo(0.8893355, 7);
		expect(v + (1 - v) * whiteNoiseValue(lambda)).toBeCloseTo(0.8893355, 7);
	});

	it('the ladder is Σ_{i≤r} λ_i², and the target must be declared in decreasing order', () => {
		expect(targetBounds(lambda)).toEqual([lambda[0] ** 2, lambda[0] ** 2 + lambda[1] ** 2]);
		expect(() => targetCoefficients([0.3, 0.5, 0.1], 3)).toThrow(
			/target\[1\]: the coefficients must not increase/
		);
		expect(() => targetCoefficients([0.5, 0.3], 3)).toThrow(/expected 3 Schmidt coefficients/);
	});
});

describe('F̃ never exceeds the true fidelity; the normalisation matters', () => {
	it('random pure states and mixtures, d = 3 and 4: F̃ ≤ F(ρ, Φ_λ)', () => {
		const random = uniforms(17);
		for (const lambda of [
			targetCoefficients([0.863, 0.485, 0.143], 3),
			targetCoefficients([0.717, 0.501, 0.448, 0.182], 4)
		]) {
			const d = lambda.length;
			for (let k = 0; k < 300; k++) {
				const parts = Array.from({ length: 1 + (k % 3) }, () => {
					const psi = Array.from({ length: d }, () =>
						Array.from({ length: d }, () => [random() - 0.5, random() - 0.5] as C)
					);
					if (k % 5 === 0)
						psi.forEach((row, m) => row.forEach((z, n) => m === n && ((z[0] += lambda[m] * 3), 0)));
					return { w: random(), data: pureData(psi, lambda) };
				});
				const total = parts.reduce((a, x) => a + x.w, 0);
				const p0 = new Float64Array(d * d);
				let q = new Array(d).fill(0);
				let fidelity = 0;
				for (const { w, data } of parts) {
					data.p0.forEach((x, c) => (p0[c] += (w / total) * x));
					q = q.map((x, j) => x + (w / total) * data.q[j]);
					fidelity += (w / total) * data.fidelity;
				}
				expect(targetFidelity(p0, 1, sum(q), lambda)).toBeLessThanOrEqual(fidelity + 1e-10);
			}
		}
	});

	it('d = 4, λ ∝ (.717, .501, .448, .182): normalised by the tilted table itself a product state reaches 0.566 > B₁ = 0.515; by the computational total it stays below', () => {
		const lambda = targetCoefficients([0.717, 0.501, 0.448, 0.182], 4);
		// The maximiser a search (scipy BFGS, 30 starts) found for the self-normalised statistic, rounded.
		const psi: C[] = [
			[0.196684, -0.160514],
			[0.250114, -0.204121],
			[0.271034, -0.221194],
			[0.652326, -0.532366]
		];
		const phi: C[] = [
			[0.05492, -0.24786],
			[0.069835, -0.315195],
			[0.075678, -0.341561],
			[0.182135, -0.822047]
		];
		const state = psi.map((a) => phi.map((b) => mul(a, b)));
		const data = pureData(state, lambda);
		// Full tilted table q(a, b) = |⟨ṽ_a|ψ⟩|²·|⟨ṽ_b*|φ⟩|² of this product state.
		const v = tilted(lambda);
		const side = (x: C[], star: boolean) =>
			v.map((vec) => {
				let amp: C = [0, 0];
				vec.forEach((c, m) => {
					const z = mul(star ? c : conj(c), x[m]);
					amp = [amp[0] + z[0], amp[1] + z[1]];
				});
				return amp[0] ** 2 + amp[1] ** 2;
			});
		const [a, b] = [side(psi, false), side(phi, true)];
		const table =
			(sum(a) * sum(b)) /
			(sum(psi.map((z) => z[0] ** 2 + z[1] ** 2)) * sum(phi.map((z) => z[0] ** 2 + z[1] ** 2)));
		const selfNormalised = targetFidelity(data.p0, 1, sum(data.q) / table, lambda);
		expect(selfNormalised).toBeCloseTo(0.5657, 3);
		expect(selfNormalised).toBeGreaterThan(targetBounds(lambda)[0]);
		expect(targetBounds(lambda)[0]).toBeCloseTo(0.515, 3);
		expect(statOf(data, lambda)).toBeLessThanOrEqual(data.fidelity + 1e-12);
		expect(statOf(data, lambda)).toBeLessThan(targetBounds(lambda)[0]);
	});
});

describe('the exact lower bound holds for the true F̃ (coverage)', () => {
	it('Poisson experiments at the isotropic example: misses ≤ α + 3 SE, and it certifies what the data show', () => {
		const lambda = targetCoefficients([0.863, 0.485, 0.143], 3);
		const v = 0.9;
		const pure = pureData(targetState(lambda), lambda);
		const p0 = Float64Array.from(pure.p0, (x) => v * x + (1 - v) / 9);
		const q = pure.q.map((x) => v * x + (1 - v) / 9);
		const truth = targetFidelity(p0, 1, sum(q), lambda);
		const draw = poissonSource(5);
		const alpha = 0.1;
		const runs = 400;
		let misses = 0;
		let certifiedTwo = 0;
		let beyond = 0;
		for (let k = 0; k < runs; k++) {
			const n = 5000; // pairs per integration time
			const data = {
				computational: Float64Array.from(p0, (x) => draw(n * x)),
				tilted: q.map((x) => draw(n * x))
			};
			const lower = targetLowerBound(data, lambda, alpha);
			if (lower > truth) misses++;
			const [b1, b2] = targetBounds(lambda);
			if (lower > b1) certifiedTwo++;
			if (lower > b2) beyond++;
			expect(targetPointValue(data, lambda)).toBeGreaterThan(lower);
		}
		const se = Math.sqrt((alpha * (1 - alpha)) / runs);
		expect(misses / runs).toBeLessThanOrEqual(alpha + 3 * se);
		// F̃ = 0.889 lies between B₁ = λ₀² ≈ 0.745 and B₂ = λ₀² + λ₁² ≈ 0.980: ≥ 2, never ≥ 3.
		expect(beyond).toBe(0);
		expect(certifiedTwo / runs).toBeGreaterThan(0.9);
	});
});
