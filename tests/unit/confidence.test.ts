import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import {
	certify,
	expectedCounts,
	outcomeProbabilities,
	states,
	witnessFamilies,
	type CountTable
} from '../../src/lib/certify';
import { lowerOrderStatistic } from '../../src/lib/certify/bootstrap';
import { drawReplicates, sufficientDraws } from '../../src/lib/certify/confidence';
import { clopperPearsonLower, clopperPearsonUpper } from '../../src/lib/certify/exact-limits';
import { fidelityCellLimits } from '../../src/lib/certify/fidelity-limits';
import { GammaSampler } from '../../src/lib/certify/gamma';
import { poissonSource } from '../../src/lib/certify/poisson';

/** Kolmogorov–Smirnov distance between a sample and a CDF. */
function ksDistance(sample: number[], cdf: (x: number) => number): number {
	const sorted = [...sample].sort((a, b) => a - b);
	let worst = 0;
	sorted.forEach((x, i) => {
		const f = cdf(x);
		worst = Math.max(worst, Math.abs(f - i / sorted.length), Math.abs((i + 1) / sorted.length - f));
	});
	return worst;
}

const table = (basis: number, counts: Float64Array): CountTable => ({
	basis,
	counts,
	accidentals: null,
	durations: null,
	present: new Uint8Array(counts.length).fill(1)
});

describe('the seeded Gamma sampler (Marsaglia & Tsang, ACM TOMS 26, 363 (2000))', () => {
	// KS test against jstat's Gamma CDF (an independent library); 1.63/√n is the 1 % critical value
	// (Kolmogorov's asymptotic distribution, any statistics handbook).
	for (const shape of [1, 2, 7.5, 40, 1e4]) {
		it(`matches the Gamma(${shape}, 1) distribution`, () => {
			const g = new GammaSampler(2024);
			const n = 20_000;
			const sample = Array.from({ length: n }, () => g.gamma(shape));
			expect(ksDistance(sample, (x) => jStat.gamma.cdf(x, shape, 1))).toBeLessThan(
				1.63 / Math.sqrt(n)
			);
		});
	}

	it('gives 0 for shape 0 and Beta draws with a zero parameter at the ends', () => {
		const g = new GammaSampler(1);
		expect(g.gamma(0)).toBe(0);
		expect(g.beta(0, 5)).toBe(0);
		expect(g.beta(5, 0)).toBe(1);
	});

	it('the first draws of seeds 1, 2, 3 … are uniform (pure-rand’s own seeding made them ≈ 1)', () => {
		// Seeds in a row are how the benchmark and the simulator use them: KS against U(0, 1).
		const firsts = Array.from({ length: 4000 }, (_, i) => new GammaSampler(i + 1).uniform());
		expect(ksDistance(firsts, (x) => x)).toBeLessThan(1.63 / Math.sqrt(4000));
		const poissonFirsts = Array.from({ length: 4000 }, (_, i) => poissonSource(i + 1)(5.9));
		const mean = poissonFirsts.reduce((s, x) => s + x, 0) / 4000;
		expect(Math.abs(mean - 5.9)).toBeLessThan(4 * Math.sqrt(5.9 / 4000));
	});
});

describe('exact limits (Clopper & Pearson, Biometrika 26, 404 (1934))', () => {
	it('agree with jstat’s Beta quantiles and with the closed forms at x = 0 and x = n', () => {
		// Beta form: Brown, Cai & DasGupta, Stat. Sci. 16, 101 (2001).
		for (const [x, n, a] of [
			[3, 10, 0.05],
			[77, 1000, 0.00135],
			[990, 1000, 1e-6]
		]) {
			expect(clopperPearsonLower(x, n, a)).toBeCloseTo(jStat.beta.inv(a, x, n - x + 1), 9);
			expect(clopperPearsonUpper(x, n, a)).toBeCloseTo(jStat.beta.inv(1 - a, x + 1, n - x), 9);
		}
		// x = n: the lower limit is α^{1/n}; 20 of 20 at 0.99865 gives 0.72 (issue 6, §2).
		expect(clopperPearsonLower(20, 20, 0.00135)).toBeCloseTo(0.00135 ** (1 / 20), 12);
		expect(clopperPearsonLower(20, 20, 0.00135)).toBeCloseTo(0.719, 3);
		expect(clopperPearsonUpper(0, 20, 0.00135)).toBeCloseTo(1 - 0.00135 ** (1 / 20), 12);
		// The cell limits' errors reach 10⁻¹⁵ (2⁻¹⁶ of α over 3·d(d − 1) cells): there 1 − α is
		// off by a percent in floating point, so the upper limit must not be read at 1 − α. The
		// zero-count limit has the closed form 1 − α^{1/n}, with α^{1/n} = exp(ln α / n) exact here.
		for (const [n, a] of [
			[1000, 7e-15],
			[1e8, 7e-15],
			[20, 4e-8]
		]) {
			const exact = -Math.expm1(Math.log(a) / n);
			expect(Math.abs(clopperPearsonUpper(0, n, a) / exact - 1)).toBeLessThan(1e-9);
		}
	});

	it('one basis alone: the α-quantile of the lower draws is the Clopper–Pearson limit', () => {
		const d = 3;
		const counts = new Float64Array(9);
		[counts[0], counts[4], counts[8], counts[1]] = [6, 6, 6, 2]; // D = 18, O = 2
		const { lower } = drawReplicates(sufficientDraws([table(0, counts)], d), {
			resamples: 40_000,
			seed: 9
		});
		const q = lowerOrderStatistic(Float64Array.from(lower).sort(), 0.1);
		// F(q) of the exact Beta(18, 3) must be 0.1 within 4 binomial standard errors.
		const coverage = jStat.beta.cdf(q, 18, 3);
		expect(Math.abs(coverage - 0.1)).toBeLessThan(4 * Math.sqrt(0.09 / 40_000));
		expect(q).toBeCloseTo(clopperPearsonLower(18, 20, 0.1), 2);
	});
});

describe('the fidelity floor and the cell limits (docs/statistics.md)', () => {
	const family = witnessFamilies['fidelity-two-basis'];
	const floorOf = (p: Float64Array[], d: number) =>
		[0, 1].reduce((s, t) => s + [...Array(d).keys()].reduce((a, j) => a + p[t][j * d + j], 0), 0) -
		1;

	it('F̃ ≥ P₀ + P₁ − 1 on dephased and uneven states, with equality for white noise', () => {
		// Cauchy–Schwarz: (Σ_m √x_m)² ≤ d·Σ_m x_m, so Γ ≤ (d − 1)(1 − P₀).
		for (const d of [3, 5, 6]) {
			for (const state of [
				states.dephased(d, 0.6, 0.9),
				states.spectrum(d, [3, 2, 1], 0.8),
				states.rankLimited(d, 2, 0.7)
			]) {
				const p = [0, 1].map((t) => outcomeProbabilities(state, t));
				expect(family.statistic(p, d, [0, 1])).toBeGreaterThanOrEqual(floorOf(p, d) - 1e-12);
			}
			const white = [0, 1].map((t) => outcomeProbabilities(states.isotropic(d, 0.4), t));
			expect(family.statistic(white, d, [0, 1])).toBeCloseTo(floorOf(white, d), 12);
		}
	});

	it('the cell-limit bound lies below F̃ at the data and tends to it with many counts', () => {
		const data = expectedCounts(states.dephased(5, 0.7, 0.95), [0, 1], 1e4);
		const stat = (p: Float64Array[]) => family.statistic(p, 5, [0, 1]);
		const plugIn = certify(data, { method: 'fidelity-two-basis', resamples: 500 }).statistic
			.plugInValue!;
		expect(fidelityCellLimits(data.tables, 5, 0.00135, stat)).toBeLessThan(plugIn);
		const big = expectedCounts(states.dephased(5, 0.7, 0.95), [0, 1], 1e9);
		expect(plugIn - fidelityCellLimits(big.tables, 5, 0.00135, stat)).toBeLessThan(1e-3);
	});

	it('the 95 % interval contains the point value and the result names its bound', () => {
		const r = certify(expectedCounts(states.isotropic(7, 0.9), [0, 1], 1e5), {
			method: 'fidelity-two-basis',
			resamples: 2000
		});
		const s = r.statistic;
		expect(s.interval95[0]).toBeLessThanOrEqual(s.value);
		expect(s.interval95[1]).toBeGreaterThanOrEqual(s.value);
		expect(['fidelity-floor', 'fidelity-cell-limits']).toContain(s.boundMethod);
		expect(s.floorValue).toBeCloseTo(s.plugInValue!, 9); // white noise: F̃ equals the floor
		for (const x of [s.plugInValue!, s.value]) {
			expect(s.interval95[0]).toBeLessThanOrEqual(x);
			expect(s.interval95[1]).toBeGreaterThanOrEqual(x);
		}
		expect(r.engine.version).toBe('3.2.0');
	});
});

describe('marginals a quantum state can give (docs/statistics.md)', () => {
	// P_s(j) + P_t(k) ≤ 1 + 1/√d for unbiased bases: the largest eigenvalue of the sum of two
	// rank-one projectors with overlap 1/d (witnesses.md §4.2, β_1).
	it('Φ_d and isotropic states with many counts are not refused', () => {
		for (const d of [5, 8]) {
			const bases = d === 5 ? [0, 1, 2] : [0, 1];
			expect(() =>
				certify(expectedCounts(states.isotropic(d, 1), bases, 1e6), { method: 'mub-correlation' })
			).not.toThrow();
			expect(() =>
				certify(expectedCounts(states.isotropic(d, 0.6), bases, 1e6), { method: 'mub-correlation' })
			).not.toThrow();
		}
	});

	it('a local-hidden-state model exactly at the limit is not refused; the entropy sum is reported', async () => {
		const { localHiddenStateAtBeta1 } = await import('../../src/lib/certify/simulate-tables');
		const state = localHiddenStateAtBeta1(7, [0, 1]);
		const tables = [0, 1].map((t) =>
			table(
				t,
				state.table(t).map((p) => Math.round(p * 1e6))
			)
		);
		const r = certify({ dimension: 7, tables }, { method: 'steering-2mub' });
		expect(r.entropicSums).toHaveLength(1);
		expect(r.entropicSums[0].side).toBe('B');
		// Maassen & Uffink, Phys. Rev. Lett. 60, 1103 (1988): H(X_0) + H(X_1) ≥ log₂ d.
		expect(r.entropicSums[0].bits).toBeGreaterThanOrEqual(Math.log2(7) - 1e-3);
	});
});

describe('rates (unequal integration times, witnesses.md §3)', () => {
	it('the fidelity method then uses the floor alone, drawn cell by cell, and says so', () => {
		const data = expectedCounts(states.isotropic(5, 0.9), [0, 1], 1e5);
		data.tables[0].durations = new Float64Array(25).map((_, c) => (c === 0 ? 2 : 1));
		const r = certify(data, { method: 'fidelity-two-basis', resamples: 3000 });
		expect(r.resampling).toBe('per-cell');
		expect(r.statistic.boundMethod).toBe('fidelity-floor');
		expect(r.warnings.join(' ')).toMatch(/floor P₀ \+ P₁ − 1 alone/);
		expect(r.statistic.lower).toBeLessThan(r.statistic.floorValue!);
	});
});
