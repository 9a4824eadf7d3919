import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import {
	bootstrapReplicates,
	empiricalQuantile,
	lowerOrderStatistic,
	standardDeviation,
	upperOrderStatistic
} from '../../src/lib/certify/bootstrap';
import { perCellModel } from '../../src/lib/certify/cell-model';
import { drawReplicates, perCellDraws } from '../../src/lib/certify/confidence';
import {
	certify,
	expectedCounts,
	outcomeProbabilities,
	sampledCounts,
	states,
	witnessFamilies
} from '../../src/lib/certify';
import { deltaMethodStandardError } from '../../src/lib/certify/model';
import { poissonSource } from '../../src/lib/certify/poisson';

describe('the seeded Poisson sampler', () => {
	// Pearson's χ² goodness-of-fit against jstat's Poisson pmf (an independent library), fixed seed;
	// means below 10 exercise inversion, the others PTRS (jstat's pmf overflows for k past ~140).
	for (const mean of [0.7, 3.7, 9.99, 10, 45.2, 90]) {
		it(`matches the Poisson(${mean}) distribution`, () => {
			const draw = poissonSource(12345);
			const n = 40_000;
			const observed = new Map<number, number>();
			for (let i = 0; i < n; i++) {
				const k = draw(mean);
				observed.set(k, (observed.get(k) ?? 0) + 1);
			}
			// Bins: single values with expected count ≥ 5, the two tails pooled.
			const lo = Math.max(0, Math.floor(mean - 4 * Math.sqrt(mean)));
			const hi = Math.ceil(mean + 4 * Math.sqrt(mean));
			let chi2 = 0;
			let bins = 0;
			let below = 0;
			for (const [k, c] of observed) if (k < lo) below += c;
			const expectBelow = lo > 0 ? n * jStat.poisson.cdf(lo - 1, mean) : 0;
			let above = n - below;
			let expectAbove = n - expectBelow;
			if (expectBelow >= 5) ((chi2 += (below - expectBelow) ** 2 / expectBelow), bins++);
			for (let k = lo; k <= hi; k++) {
				const expected = n * jStat.poisson.pdf(k, mean);
				if (expected < 5) continue;
				const count = observed.get(k) ?? 0;
				chi2 += (count - expected) ** 2 / expected;
				bins++;
				above -= count;
				expectAbove -= expected;
			}
			if (expectAbove >= 5) ((chi2 += (above - expectAbove) ** 2 / expectAbove), bins++);
			const pValue = 1 - jStat.chisquare.cdf(chi2, bins - 1);
			expect(bins).toBeGreaterThan(3);
			expect(pValue).toBeGreaterThan(0.001);
		});
	}

	it('gives zero for a zero mean and rejects seeds outside 1..2^32 − 1', () => {
		expect(poissonSource(1)(0)).toBe(0);
		expect(() => poissonSource(0)).toThrow(/seed/);
		expect(() => poissonSource(2 ** 32)).toThrow(/seed/);
	});
});

describe('bootstrap (witnesses.md §6)', () => {
	const data = sampledCounts(states.isotropic(5, 0.85), [0, 1, 2], 50_000, 99);

	it('raw counts: no resampling, so neither the seed nor the resamples move the numbers', () => {
		const a = certify(data, { method: 'mub-correlation', seed: 7, resamples: 3000 });
		const c = certify(data, { method: 'mub-correlation', seed: 8, resamples: 100 });
		expect(JSON.stringify(c.statistic)).toBe(JSON.stringify(a.statistic));
		const f = certify(data, { method: 'fidelity-two-basis', seed: 7, resamples: 3000 });
		const g = certify(data, { method: 'fidelity-two-basis', seed: 8, resamples: 100 });
		expect(JSON.stringify(g.statistic)).toBe(JSON.stringify(f.statistic));
	});

	it('per cell: same inputs and seed give bit-identical results; another seed moves them within the error', () => {
		const subtracted = {
			...data,
			tables: data.tables.map((t) => ({ ...t, accidentals: new Float64Array(25).fill(1) }))
		};
		const options = { method: 'mub-correlation', subtractAccidentals: true, resamples: 3000 };
		const a = certify(subtracted, { ...options, seed: 7 });
		const b = certify(subtracted, { ...options, seed: 7 });
		const c = certify(subtracted, { ...options, seed: 8 });
		expect(JSON.stringify(a)).toBe(JSON.stringify(b));
		expect(c.statistic.lower).not.toBe(a.statistic.lower);
		expect(Math.abs(c.statistic.lower - a.statistic.lower)).toBeLessThan(a.statistic.standardError);
	});

	it('the delta-method SE agrees with the bootstrap SE within a few per cent for large counts', () => {
		for (const method of ['mub-correlation', 'steering-2mub', 'fidelity-two-basis'] as const) {
			const r = certify(data, { method, resamples: 10_000 });
			const ratio = r.statistic.deltaMethodStandardError / r.statistic.standardError;
			expect(ratio).toBeGreaterThan(0.95);
			expect(ratio).toBeLessThan(1.05);
		}
	});

	it('the sufficient totals give the same distribution as drawing every cell (§6)', () => {
		// A sum of independent Poisson variables is Poisson: both bootstraps must agree in mean and spread.
		for (const method of ['mub-correlation', 'fidelity-two-basis'] as const) {
			const family = witnessFamilies[method];
			const bases = method === 'mub-correlation' ? [0, 1, 2] : [0, 1];
			const tables = bases.map((t) => data.tables[t]);
			const fast = bootstrapReplicates(family.sufficientModel(tables, 5, bases), {
				resamples: 10_000,
				seed: 5
			});
			const naive = bootstrapReplicates(
				perCellModel(tables, 5, (p) => family.statistic(p, 5, bases), {
					subtractAccidentals: false
				}),
				{ resamples: 10_000, seed: 6 }
			);
			const mean = (x: Float64Array) => x.reduce((s, v) => s + v, 0) / x.length;
			const se = standardDeviation(fast);
			expect(Math.abs(mean(fast) - mean(naive))).toBeLessThan(0.05 * se);
			expect(standardDeviation(naive) / se).toBeGreaterThan(0.97);
			expect(standardDeviation(naive) / se).toBeLessThan(1.03);
		}
	});

	it('cells with different integration times are normalised as rates and drawn cell by cell (§3)', () => {
		// Basis 0's cell (0, 0) integrated twice as long as the rest: its rate is N/2.
		const timed = {
			...data,
			tables: data.tables.map((t) =>
				t.basis === 0
					? { ...t, durations: new Float64Array(25).map((_, i) => (i === 0 ? 2 : 1)) }
					: t
			)
		};
		const r = certify(timed, { method: 'mub-correlation', resamples: 2000 });
		expect(r.resampling).toBe('per-cell');
		expect(r.normalisation).toBe('rates');
		const t0 = data.tables[0].counts;
		const rates = Array.from(t0, (c, i) => (i === 0 ? c / 2 : c));
		const total = rates.reduce((s, v) => s + v, 0);
		const plain = certify(data, { method: 'mub-correlation', resamples: 1000 });
		const diagonal = (t: Float64Array) =>
			[0, 6, 12, 18, 24].reduce((s, i) => s + t[i], 0) / t.reduce((s, v) => s + v, 0);
		const expected =
			plain.statistic.value -
			diagonal(t0) +
			[0, 6, 12, 18, 24].reduce((s, i) => s + rates[i], 0) / total;
		expect(r.statistic.value).toBeCloseTo(expected, 12);
	});

	it('takes the empirical quantile as the order statistic x_(⌈qB⌉)', () => {
		const sorted = Float64Array.from({ length: 10_000 }, (_, i) => i + 1);
		expect(empiricalQuantile(sorted, 1 - 0.99865)).toBe(14);
		expect(empiricalQuantile(sorted, 0.025)).toBe(250);
		expect(empiricalQuantile(sorted, 0.975)).toBe(9750);
	});

	it('bounds use the conservative order statistics x_(⌊q(B+1)⌋) below and x_(⌈q(B+1)⌉) above', () => {
		// E F(x_(k)) = k/(B + 1) for continuous draws (order statistics, common practice).
		const sorted = Float64Array.from({ length: 10_000 }, (_, i) => i + 1);
		expect(lowerOrderStatistic(sorted, 1 - 0.99865)).toBe(13);
		expect(lowerOrderStatistic(sorted, 0.025)).toBe(250);
		expect(upperOrderStatistic(sorted, 0.975)).toBe(9751);
		expect(lowerOrderStatistic(sorted, 1e-6)).toBe(1);
	});

	it('Φ⁻¹(0.99865) ≈ 3.0000 (any handbook normal table), agreeing with jstat', () => {
		expect(normalQuantile(0.99865, 0, 1)).toBeCloseTo(3.0, 3);
		expect(normalQuantile(0.99865, 0, 1)).toBeCloseTo(jStat.normal.inv(0.99865, 0, 1), 8);
	});
});

describe('coverage of the one-sided bound (witnesses.md §6)', () => {
	const experiments = 400;

	function coverage(
		method: 'mub-correlation' | 'fidelity-two-basis',
		confidence: number,
		stateOf: () => ReturnType<typeof states.isotropic>,
		bases: number[]
	) {
		const state = stateOf();
		const d = state.dimension;
		const truth = witnessFamilies[method].statistic(
			bases.map((t) => outcomeProbabilities(state, t)),
			d,
			bases
		);
		let covered = 0;
		let certifiedAbove: number[] = [];
		for (let e = 0; e < experiments; e++) {
			const result = certify(sampledCounts(state, bases, 20_000, 1000 + e), {
				method,
				bases,
				confidence,
				resamples: 2000,
				seed: 1 + e
			});
			if (result.statistic.lower < truth) covered++;
			certifiedAbove.push(result.certifiedSchmidtNumber);
		}
		return { rate: covered / experiments, certified: certifiedAbove };
	}

	it('the lower bound lies below the true value in about `confidence` of 400 experiments', () => {
		const mub = coverage('mub-correlation', 0.9, () => states.isotropic(5, 0.8), [0, 1, 2]);
		expect(Math.abs(mub.rate - 0.9)).toBeLessThan(0.045);
		// The fidelity bound spends α/2 on each of two bounds (docs/statistics.md): conservative.
		const fidelity = coverage('fidelity-two-basis', 0.9, () => states.isotropic(5, 0.8), [0, 1]);
		expect(fidelity.rate).toBeGreaterThan(0.9 - 0.045);
		const strict = coverage('mub-correlation', 0.99865, () => states.isotropic(5, 0.8), [0, 1, 2]);
		expect(strict.rate).toBeGreaterThanOrEqual(0.985);
	});

	it('the boundary state Φ_2 (d = 5) certifies more than 2 in at most about 1 − confidence of experiments', () => {
		const { certified } = coverage('mub-correlation', 0.9, () => states.rankLimited(5, 2), [0, 1]);
		const over = certified.filter((k) => k > 2).length / experiments;
		expect(over).toBeLessThan(0.1 + 0.045);
	});
});

describe('the lower bound is the documented quantile of the documented draws', () => {
	it('drawReplicates of the per-cell draws reproduce certify() (reproducibility contract)', () => {
		const data = expectedCounts(states.isotropic(7, 0.9), [0, 1], 1e6);
		data.tables[0].durations = new Float64Array(49).map((_, c) => (c === 0 ? 2 : 1));
		const reps = drawReplicates(perCellDraws(data.tables, 7, false), { resamples: 1500, seed: 3 });
		const r = certify(data, { method: 'steering-2mub', resamples: 1500, seed: 3 });
		const sorted = Float64Array.from(reps.lower).sort();
		expect(lowerOrderStatistic(sorted, 1 - 0.99865)).toBe(r.statistic.lower);
		expect(standardDeviation(reps.lower)).toBe(r.statistic.standardError);
	});
});

describe('closed-form gradients for the delta method', () => {
	it('agree with central differences of the same statistic', () => {
		const data = sampledCounts(states.dephased(4, 0.7, 0.9), [0, 1, 2], 30_000, 4, 'field');
		for (const [method, bases] of [
			['mub-correlation', [0, 1, 2]],
			['fidelity-two-basis', [0, 1]]
		] as const) {
			const model = witnessFamilies[method].sufficientModel(
				bases.map((t) => data.tables[t]),
				4,
				[...bases],
				'field'
			);
			const closed = deltaMethodStandardError(model);
			const numeric = deltaMethodStandardError({ means: model.means, statistic: model.statistic });
			expect(closed / numeric).toBeCloseTo(1, 5);
		}
	});
});
