/**
 * λ fitted on a separate calibration run (witnesses.md §4.3′, §9; fidelity-target/fit.ts): the fit
 * recovers the target of Φ_λ, whose computational table is p₀(m, m) = λ_m² by definition (§4.3′);
 * fitting on the certified counts is refused; and with λ fitted on an independent run and frozen,
 * the lower bound stays below the true F̃ for that λ in about `confidence` of experiments
 * (allowance nominal·N + 3·√(N·p(1 − p)) + 1, common practice).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/lib/certify';
import {
	certifyTarget,
	fitTarget,
	requireSeparateRun,
	targetCoefficients
} from '../../src/lib/certify/fidelity-target';
import { sampleTables } from '../../src/lib/certify/simulate-tables';
import { missAllowance } from '../../scripts/coverage-run';
import { targetState, trueTargetValue } from '../../scripts/coverage-target';

const D3 = [0.863, 0.485, 0.143];
const phi = targetState('Φλ', D3, D3, 1, 3);
const expected = (pairs: number) => ({
	dimension: 3,
	tables: [0, 1].map((basis) => ({
		basis,
		counts: phi.table(basis).map((p) => p * pairs),
		accidentals: null,
		durations: null,
		present: new Uint8Array(9).fill(1)
	}))
});

describe('fitting λ on a calibration run', () => {
	it('recovers λ of Φ_λ from its computational table (p₀(m, m) = λ_m², §4.3′)', () => {
		const fit = fitTarget(expected(1e6), 'a'.repeat(64));
		const unit = targetCoefficients(D3, 3);
		fit.coefficients.forEach((x, m) => expect(x).toBeCloseTo(unit[m], 12));
		expect(fit.runSha256).toBe('a'.repeat(64));
	});

	it('refuses the certified counts as their own calibration run (§9), same bytes or same table', () => {
		const data = expected(1e6);
		expect(() => requireSeparateRun(data, 'x', expected(2e6), 'x')).toThrow(/very counts/);
		expect(() => requireSeparateRun(data, 'x', expected(1e6), 'y')).toThrow(/very counts/);
		expect(() => requireSeparateRun(data, 'x', expected(2e6), 'y')).not.toThrow();
	});

	it('refuses a run whose matching pairs increase with the mode, naming it', () => {
		const data = expected(1e6);
		data.tables[0].counts[8] = 1e7;
		expect(() => fitTarget(data, 'r')).toThrow(InputError);
		expect(() => fitTarget(data, 'r')).toThrow(/mode 1 .* to mode 2/);
	});

	it('with λ fitted on an independent run and frozen, the bound keeps its level', () => {
		// The run is the computational table of 0.9·Φ_λ + white; the certified data are then
		// measured in the tilted vectors of the fitted λ (they are built on it, §4.3′).
		const source = targetState('0.9·Φλ + white', D3, D3, 0.9, 3, true);
		for (const [confidence, experiments] of [
			[0.9, 300],
			[0.99865, 600]
		]) {
			let misses = 0;
			for (let e = 0; e < experiments; e++) {
				const fit = fitTarget(sampleTables(source, [0], 2000, 10_000 + e), `run-${e}`);
				const state = targetState('measured', fit.coefficients, D3, 0.9, 3, true);
				const data = sampleTables(state, [0, 1], 2000, 50_000 + e);
				const lower = certifyTarget(data, { target: fit.coefficients, confidence }).statistic.lower;
				if (lower > trueTargetValue({ target: fit.coefficients, state })) misses++;
			}
			expect(misses).toBeLessThanOrEqual(missAllowance(1 - confidence, experiments));
		}
	});
});
