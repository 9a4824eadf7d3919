/**
 * The planner (issue 19, part 3): critical visibilities against published bounds, and counts for
 * 90 % power checked by an independent seeded simulation of the engine as a group would run it.
 */
import { describe, expect, it } from 'vitest';
import { certify, sampledCounts, states } from '../../src/lib/certify';
import { planExperiment } from '../../src/lib/certify/planner/plan-experiment';
import { countsAdvice } from '../../src/lib/certify/planner/check-counts';

/** Fraction of `runs` experiments (counts per basis, engine defaults) that certify k. */
function powerOf(
	method: 'mub-correlation' | 'steering-2mub',
	d: number,
	eta: number,
	k: number,
	perBasis: number,
	runs: number
) {
	let certified = 0;
	for (let i = 0; i < runs; i++) {
		// Seeds far from the planner's own (1, 3, 5, …): an independent set of experiments.
		const data = sampledCounts(states.isotropic(d, eta), [0, 1], perBasis, 900_001 + i);
		const r = certify(data, { method, seed: 77 + i });
		if (r.certifiedSchmidtNumber >= k) certified++;
	}
	return certified / runs;
}

describe('critical visibilities (witnesses.md §7)', () => {
	it('steering test, Schmidt number 4 in d = 4: 0.935', () => {
		// β_3 = (1 + 1/√4)·2√3/(1 + √3) (Phys. Rev. Lett. 126, 200404 (2021), as in witnesses.md §4.2);
		// η* = (β_3/2 − 1/4)/(1 − 1/4) = 0.93462; common practice rounds it to "about 95 %".
		const plan = planExperiment({
			method: 'steering-2mub',
			dimension: 4,
			schmidtNumber: 4,
			visibility: 0.9,
			simulate: 'none'
		});
		expect(plan.design.criticalVisibility).toBeCloseTo(0.935, 3);
		expect(plan.rungs[2].criticalVisibility).toBeCloseTo(0.934616, 6);
		// Below the critical visibility no number of counts helps.
		expect(plan.design.countsPerBasis).toBeNull();
	});

	it('for the steering test the critical visibility falls as the dimension grows', () => {
		const plan = planExperiment({
			method: 'steering-2mub',
			dimension: 4,
			schmidtNumber: 3,
			visibility: 0.9,
			simulate: 'none'
		});
		const eta = plan.curve.map((p) => p.criticalVisibility);
		expect(plan.curve.length).toBeGreaterThan(8);
		for (let i = 1; i < eta.length; i++) expect(eta[i]).toBeLessThan(eta[i - 1]);
	});

	it('the correlation sum over m bases: (B_r/m − 1/d)/(1 − 1/d) with B_r = 1 + (m − 1)r/d', () => {
		// Spengler et al., Phys. Rev. A 86, 022311 (2012) for r = 1; witnesses.md §4.1, §7.
		const plan = planExperiment({
			method: 'mub-correlation',
			dimension: 7,
			schmidtNumber: 5,
			visibility: 0.9,
			bases: 'all',
			simulate: 'none'
		});
		expect(plan.request.bases).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
		const [m, d, r] = [8, 7, 4];
		expect(plan.design.criticalVisibility).toBeCloseTo(
			((1 + ((m - 1) * r) / d) / m - 1 / d) / (1 - 1 / d),
			12
		);
		// The trade-off table names the two-basis design of the same method and the other methods.
		const names = plan.alternatives.map((a) => `${a.method}:${a.bases.length}`);
		expect(names).toEqual(
			expect.arrayContaining(['mub-correlation:2', 'steering-2mub:2', 'fidelity-two-basis:2'])
		);
	});
});

describe('counts for 90 % power, by simulating the engine', () => {
	it('isotropic 0.96, d = 31, k = 29, two bases: 300 independent experiments reach ≥ 85 %', () => {
		const plan = planExperiment({
			method: 'mub-correlation',
			dimension: 31,
			schmidtNumber: 29,
			visibility: 0.96
		});
		const n = plan.design.countsPerBasis!;
		expect(plan.design.power).toBeGreaterThanOrEqual(0.9);
		expect(powerOf('mub-correlation', 31, 0.96, 29, n, 300)).toBeGreaterThanOrEqual(0.85);
	});

	it('the check page names counts that reach ≥ 85 % power (engine 2.1.0 named 36.7 %)', () => {
		// An unsupported claim whose point value clears the rung: the verdict names the counts needed.
		const data = sampledCounts(states.isotropic(31, 0.96), [0, 1], 1000, 5);
		const options = { method: 'mub-correlation', claim: 29 };
		const r = certify(data, options);
		expect(r.claim!.verdict).toBe('not supported');
		expect(r.pointSchmidtNumber).toBeGreaterThanOrEqual(29);
		const perBasis = Math.ceil(countsAdvice(data, options, r)!.totalCounts! / 2);
		expect(powerOf('mub-correlation', 31, 0.96, 29, perBasis, 300)).toBeGreaterThanOrEqual(0.85);
	});
});

describe('simulated experiments the engine refuses', () => {
	it('count as not certified (a basis with no counts at all certifies nothing)', () => {
		// d = 5, all six bases, η = 0.95: the search starts at a few counts per basis, where empty bases occur.
		const plan = planExperiment({
			method: 'mub-correlation',
			dimension: 5,
			schmidtNumber: 4,
			visibility: 0.95,
			bases: 'all'
		});
		expect(plan.design.countsPerBasis).toBeGreaterThan(1);
		expect(plan.design.power).toBeGreaterThanOrEqual(0.9);
	});
});
