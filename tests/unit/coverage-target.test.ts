/**
 * Coverage of fidelity-target (witnesses.md §4.3′; scripts/coverage-target.ts): the simulated
 * states reproduce the contract's check values, and seeded runs at the boundary (Φ_λ cut to its r
 * largest coefficients: Schmidt number r, F = Σ_{i≤r} λ_i² exactly) stay within nominal:
 * nominal·N + 3·√(N·p(1 − p)) + 1 (a 3σ binomial allowance, common practice).
 */
import { describe, expect, it } from 'vitest';
import { targetBounds, targetCoefficients } from '../../src/lib/certify/fidelity-target';
import { missAllowance } from '../../scripts/coverage-run';
import {
	runTargetCoverage,
	targetState,
	trueTargetValue,
	truncatedTarget
} from '../../scripts/coverage-target';

const D3 = [0.863, 0.485, 0.143];
const unit = targetCoefficients(D3, 3);

describe('the simulated fidelity-target states', () => {
	it('v·Φ_λ + (1 − v)𝟙/d² at v = 0.9 gives F̃ = 0.8893355 (witnesses.md §4.3′ check value)', () => {
		const state = targetState('iso', D3, D3, 0.9, 3, true);
		expect(trueTargetValue({ target: D3, state })).toBeCloseTo(0.8893355, 7);
		// F(ρ, Φ_λ) = v + (1 − v)/d² for this mixture (Φ_λ is normalised), and F̃ ≤ F (§4.3′).
		expect(state.fidelity).toBeCloseTo(0.9 + 0.1 / 9, 12);
		expect(trueTargetValue({ target: D3, state })).toBeLessThanOrEqual(state.fidelity!);
	});

	it('|00⟩ gives F̃ = F = λ₀²; Φ_λ gives 1 (witnesses.md §4.3′ checks)', () => {
		const product = truncatedTarget(D3, 1);
		expect(trueTargetValue({ target: D3, state: product })).toBeCloseTo(unit[0] ** 2, 12);
		expect(product.fidelity).toBeCloseTo(unit[0] ** 2, 12);
		const phi = targetState('Φλ', D3, D3, 1, 3);
		expect(trueTargetValue({ target: D3, state: phi })).toBeCloseTo(1, 12);
	});

	it('the cut to r = 2 sits on the rung: F = λ₀² + λ₁² = B₂ (Bavaresco et al., Nat. Phys. 14, 1032 (2018))', () => {
		const cut = truncatedTarget(D3, 2);
		expect(cut.fidelity).toBeCloseTo(targetBounds(unit)[1], 12);
		expect(trueTargetValue({ target: D3, state: cut })).toBeLessThanOrEqual(cut.fidelity! + 1e-12);
	});
});

describe('coverage at the boundary', () => {
	for (const [target, r] of [
		[D3, 1],
		[D3, 2],
		[[0.717, 0.501, 0.448, 0.182], 3]
	] as const) {
		for (const pairs of [100, 10_000]) {
			it(`λ of d = ${target.length}, cut to r = ${r}, ${pairs} pairs: within nominal at 0.9 and 0.99865`, () => {
				for (const [confidence, experiments] of [
					[0.9, 400],
					[0.99865, 800]
				]) {
					const state = truncatedTarget([...target], r);
					const o = runTargetCoverage(
						{ target: [...target], state },
						{ pairs, confidence, experiments, firstSeed: 91 }
					);
					const limit = missAllowance(1 - confidence, experiments - o.refused);
					expect(o.refused).toBe(0);
					expect(o.falseCertificates).toBeLessThanOrEqual(limit);
					expect(o.misses).toBeLessThanOrEqual(limit);
					expect(o.missesOfFidelity).toBeLessThanOrEqual(limit);
				}
			});
		}
	}
});
