/**
 * Fewer runs of the coverage benchmark's settings (scripts/coverage.ts), seeded and so
 * deterministic: each fails when a miss or false-certification count is clearly above nominal,
 * nominal·N + 3·√(N·p(1 − p)) + 1 (a 3σ binomial allowance, common practice).
 */
import { describe, expect, it } from 'vitest';
import { states, type MethodId } from '../../src/lib/certify';
import {
	localHiddenStateAtBeta1,
	separableFourierCorrelated,
	simulatedState,
	type TableState
} from '../../src/lib/certify/simulate-tables';
import { missAllowance, runCoverage } from '../../scripts/coverage-run';

const cases: [MethodId, TableState, number[]][] = [
	['mub-correlation', simulatedState('Φ3 d=7', states.rankLimited(7, 3)), [0, 1, 2, 3]],
	['mub-correlation', simulatedState('Φ7 d=8', states.rankLimited(8, 7)), [0, 1]],
	['steering-2mub', localHiddenStateAtBeta1(7, [0, 1]), [0, 1]],
	['fidelity-two-basis', separableFourierCorrelated(13), [0, 1]],
	['fidelity-two-basis', simulatedState('iso d=11', states.isotropic(11, 0.8)), [0, 1]]
];

describe('coverage of the lower bound and of the certificate (docs/statistics.md)', () => {
	for (const [method, state, bases] of cases) {
		for (const countsPerBasis of [20, 1000]) {
			it(`${method}, ${state.label}, ${countsPerBasis} per basis: within nominal at 0.9 and 0.99865`, () => {
				for (const [confidence, experiments, resamples] of [
					[0.9, 150, 400],
					[0.99865, 300, 1500]
				]) {
					const o = runCoverage(
						{ method, bases, state },
						{ countsPerBasis, confidence, experiments, resamples, firstSeed: 77 }
					);
					const limit = missAllowance(1 - confidence, experiments - o.refused);
					expect(o.refused).toBe(0);
					expect(o.misses).toBeLessThanOrEqual(limit);
					expect(o.falseCertificates).toBeLessThanOrEqual(limit);
					if (o.missesOfFidelity !== null) expect(o.missesOfFidelity).toBeLessThanOrEqual(limit);
				}
			});
		}
	}

	it('a boundary state is not simply never certified: Φ_3 in d = 7 reaches 3 at 1000 counts', () => {
		const o = runCoverage(
			{
				method: 'mub-correlation',
				bases: [0, 1],
				state: simulatedState('Φ3', states.rankLimited(7, 3))
			},
			{ countsPerBasis: 1000, confidence: 0.9, experiments: 100, resamples: 400, firstSeed: 5 }
		);
		expect(o.meanCertified).toBeGreaterThan(2.9);
	});
});
