/**
 * No level leak from too few resamples (issue 15 §2, engine 3.0.0). Raw-count sums are convolved
 * exactly (no replicates), so 100 resamples cannot spend more than the nominal error; bounds that
 * still read replicates (rates, subtracted accidentals) refuse fewer than ⌈2/α⌉ (⌈4/α⌉ where the
 * bound spends α/2). Allowance: nominal·N + 3·√(N·p(1 − p)) + 1 (a 3σ binomial allowance,
 * common practice). The grid quantile is checked against the Irwin–Hall distribution (the sum of
 * n uniforms; Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions 2, from memory)
 * and against jstat's Beta quantile (Clopper & Pearson, Biometrika 26, 404 (1934)).
 */
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { certify, expectedCounts, InputError, states } from '../../src/lib/certify';
import { simulatedState } from '../../src/lib/certify/simulate-tables';
import { sumLowerQuantile, sumUpperQuantile } from '../../src/lib/certify/sum-quantile';
import { missAllowance, runCoverage } from '../../scripts/coverage-run';

describe('100 resamples at 0.99865 (the smallest replicate under engine 2.1.0)', () => {
	it('the boundary state Φ3 (d = 7, bases 0 and 1) is falsely certified at most at the nominal rate', () => {
		// Engine 2.1.0 read the bound off the smallest of 100 replicates: about 1/101 ≈ 1 % here.
		const experiments = 2000;
		const o = runCoverage(
			{
				method: 'mub-correlation',
				bases: [0, 1],
				state: simulatedState('Φ3', states.rankLimited(7, 3))
			},
			{ countsPerBasis: 1000, confidence: 0.99865, experiments, resamples: 100, firstSeed: 501 }
		);
		expect(o.refused).toBe(0);
		expect(o.falseCertificates).toBeLessThanOrEqual(missAllowance(1 - 0.99865, experiments));
	});

	it('bounds read off replicates refuse fewer than ⌈2/α⌉ (⌈4/α⌉ for the fidelity floor), saying why', () => {
		const data = expectedCounts(states.isotropic(5, 0.9), [0, 1], 1e4);
		for (const t of data.tables) t.accidentals = new Float64Array(25).fill(1);
		const at = (method: string, resamples: number) => () =>
			certify(data, { method, resamples, subtractAccidentals: true });
		expect(at('mub-correlation', 1481)).toThrow(InputError);
		expect(at('mub-correlation', 1481)).toThrow(
			/resamples must be at least 1,482 at confidence 0.99865/
		);
		expect(at('mub-correlation', 1482)).not.toThrow();
		expect(at('fidelity-two-basis', 2962)).toThrow(/at least 2,963/);
		expect(at('fidelity-two-basis', 2963)).not.toThrow();
	});
});

describe('the quantile of a sum without Monte-Carlo error, on the safe side', () => {
	const irwinHallCdf = (x: number, n: number) => {
		let s = 0;
		for (let k = 0; k <= n && k < x; k++) s += (-1) ** k * jStat.combination(n, k) * (x - k) ** n;
		return s / jStat.factorial(n);
	};
	const quantile = (q: number, n: number) => {
		let [lo, hi] = [0, n];
		for (let i = 0; i < 200; i++) {
			const mid = (lo + hi) / 2;
			if (irwinHallCdf(mid, n) < q) lo = mid;
			else hi = mid;
		}
		return lo;
	};

	for (const n of [2, 3, 12]) {
		it(`sum of ${n} uniforms: below the Irwin–Hall quantile by at most 5 % of its SD`, () => {
			const uniforms = Array.from({ length: n }, () => ({ a: 1, b: 1, weight: 1 }));
			const sd = Math.sqrt(n / 12);
			for (const q of [0.00135, 0.025, 0.5]) {
				const exact = quantile(q, n);
				const grid = sumLowerQuantile(uniforms, q);
				expect(grid).toBeLessThanOrEqual(exact);
				expect(grid).toBeGreaterThan(exact - 0.05 * sd);
				// The upper quantile mirrors it: at or above n − (the lower (1 − q)-quantile).
				expect(sumUpperQuantile(uniforms, 1 - q)).toBeGreaterThanOrEqual(n - exact);
			}
		});
	}

	it('one term alone is the Beta quantile itself (Clopper–Pearson for one basis)', () => {
		expect(sumLowerQuantile([{ a: 29, b: 2, weight: 1 }], 0.00135)).toBeCloseTo(
			jStat.beta.inv(0.00135, 29, 2),
			10
		);
	});
});
