/**
 * The planner for fidelity-target (planner/plan-target.ts, witnesses.md §4.3′): critical
 * visibilities from the contract's white-noise formula, and counts that reach the power they name
 * when the check is re-run on fresh experiments (the standard: ≥ 85 % in 300 at a 90 % figure).
 */
import { describe, expect, it } from 'vitest';
import {
	certifyTarget,
	targetBounds,
	targetCoefficients
} from '../../src/lib/certify/fidelity-target';
import { targetState } from '../../src/lib/certify/fidelity-target/states';
import { sampleTables } from '../../src/lib/certify/simulate-tables';
import { planTarget } from '../../src/lib/certify/planner/plan-target';

const D3 = [0.863, 0.485, 0.143];

describe('planning a fidelity-target experiment', () => {
	it('critical visibilities follow F̃(v) = v + (1 − v)·w, w from §4.3′’s example (v = 0.9: 0.8893355)', () => {
		// §4.3′: F̃(0.9) = 0.8893355 for λ ∝ (.863, .485, .143), so w = (0.8893355 − 0.9)/(1 − 0.9).
		const w = (0.8893355 - 0.9) / 0.1;
		const plan = planTarget({ target: D3, schmidtNumber: 3, visibility: 0.99 });
		const bounds = targetBounds(targetCoefficients(D3, 3));
		plan.rungs.forEach((rung, i) => {
			expect(rung.bound).toBeCloseTo(bounds[i], 12);
			expect(rung.criticalVisibility).toBeCloseTo((bounds[i] - w) / (1 - w), 6);
		});
		const below = planTarget({
			target: D3,
			schmidtNumber: 3,
			visibility: plan.criticalVisibility - 0.01
		});
		expect(below.pairsNeeded).toBeNull();
		expect(below.note).toMatch(/no number of counts helps/);
	});

	it('the pairs it names certify k = 2 in ≥ 85 % of 300 fresh experiments at v = 0.9', () => {
		const plan = planTarget({ target: D3, schmidtNumber: 2, visibility: 0.9 });
		expect(plan.power).toBeGreaterThanOrEqual(0.9);
		const pairs = plan.pairsNeeded!;
		const state = targetState('0.9·Φλ + white', D3, D3, 0.9, 3, true);
		let certified = 0;
		for (let e = 0; e < 300; e++) {
			const data = sampleTables(state, [0, 1], pairs, 700_000 + e);
			if (certifyTarget(data, { target: D3 }).certifiedSchmidtNumber >= 2) certified++;
		}
		expect(certified / 300).toBeGreaterThanOrEqual(0.85);
		// And clearly fewer pairs fall short: the figure is not padded.
		let fewer = 0;
		for (let e = 0; e < 300; e++) {
			const data = sampleTables(state, [0, 1], Math.round(pairs / 4), 900_000 + e);
			if (certifyTarget(data, { target: D3 }).certifiedSchmidtNumber >= 2) fewer++;
		}
		expect(fewer / 300).toBeLessThan(0.85);
	});
});
