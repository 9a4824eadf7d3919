/**
 * The reproductions of issue 6, §1–§4, each its own test. They use only what engine 1.0.0
 * already had (certify, the simulator, the Poisson sampler), so they can be run against it:
 * every one fails there. Rates are judged by missAllowance: nominal·N + 3·√(N·p(1 − p)) + 1.
 */
import { describe, expect, it } from 'vitest';
import {
	certify,
	sampledCounts,
	states,
	type CountsDataset,
	type CountTable
} from '../../src/lib/certify';
import { PoissonSampler, prepareMeans } from '../../src/lib/certify/poisson';

const allowance = (nominal: number, n: number) =>
	nominal * n + 3 * Math.sqrt(n * nominal * (1 - nominal)) + 1;

const table = (basis: number, counts: Float64Array): CountTable => ({
	basis,
	counts,
	accidentals: null,
	durations: null,
	present: new Uint8Array(counts.length).fill(1)
});

/** Separable: basis 0 uniform, basis 1 perfectly correlated (F̃ = F = 1/d, the r = 1 rung). */
function separableMeans(d: number, perBasis: number): Float64Array[] {
	const m0 = new Float64Array(d * d).fill(perBasis / (d * d));
	const m1 = new Float64Array(d * d);
	for (let a = 0; a < d; a++) m1[a * d + a] = perBasis / d;
	return [m0, m1];
}

function separableDraw(d: number, perBasis: number, seed: number): CountsDataset {
	const sampler = new PoissonSampler(seed);
	const tables = separableMeans(d, perBasis).map((means, basis) => {
		const counts = new Float64Array(d * d);
		sampler.drawAll(prepareMeans(means), counts);
		return table(basis, counts);
	});
	return { dimension: d, tables };
}

function diagonalOnly(d: number, perBasis: number, cellsUsed = d): CountsDataset {
	const tables = [0, 1].map((basis) => {
		const counts = new Float64Array(d * d);
		for (let k = 0; k < perBasis; k++) counts[(k % cellsUsed) * (d + 1)]++;
		return table(basis, counts);
	});
	return { dimension: d, tables };
}

describe('issue 6 §1: the fidelity bound certifies separable states', () => {
	it('exact expected counts of the d = 13 separable state certify nothing; the interval holds the value', () => {
		const data: CountsDataset = {
			dimension: 13,
			tables: [
				table(0, new Float64Array(169).fill(6)),
				table(
					1,
					new Float64Array(169).map((_, c) => (c % 14 === 0 ? 77 : 0))
				)
			]
		};
		const r = certify(data, { method: 'fidelity-two-basis', claim: 2 });
		expect(r.statistic.plugInValue).toBeCloseTo(1 / 13, 12);
		expect(r.statistic.value).toBeLessThanOrEqual(1 / 13);
		expect(r.pointSchmidtNumber).toBe(1);
		expect(r.certifiedSchmidtNumber).toBe(1);
		expect(r.claim!.verdict).toBe('not supported');
		for (const x of [r.statistic.value, r.statistic.plugInValue!]) {
			expect(r.statistic.interval95[0]).toBeLessThanOrEqual(x);
			expect(r.statistic.interval95[1]).toBeGreaterThanOrEqual(x);
		}
	});

	for (const [perBasis, experiments] of [
		[1000, 60],
		[20_000, 100]
	]) {
		it(`Poisson draws of it at ${perBasis} counts per basis: certified 2 within the allowance`, () => {
			let wrong = 0;
			for (let e = 0; e < experiments; e++) {
				const r = certify(separableDraw(13, perBasis, 500 + e), {
					method: 'fidelity-two-basis',
					resamples: 2000,
					seed: 1 + e
				});
				if (r.certifiedSchmidtNumber > 1) wrong++;
			}
			expect(wrong).toBeLessThanOrEqual(allowance(1 - 0.99865, experiments));
		});
	}

	it('isotropic d = 11, η = 0.8, 500 counts: the lower bound misses the true F̃ within the allowance', () => {
		// White noise: the true F̃ equals the floor 2(η + (1 − η)/d) − 1.
		const truth = 2 * (0.8 + 0.2 / 11) - 1;
		for (const [confidence, experiments] of [
			[0.99865, 60],
			[0.9, 100]
		]) {
			let misses = 0;
			for (let e = 0; e < experiments; e++) {
				const data = sampledCounts(states.isotropic(11, 0.8), [0, 1], 500, 900 + e);
				const r = certify(data, {
					method: 'fidelity-two-basis',
					confidence,
					resamples: 1000,
					seed: e + 1
				});
				if (r.statistic.lower > truth) misses++;
			}
			expect(misses).toBeLessThanOrEqual(allowance(1 - confidence, experiments));
		}
	});
});

describe('issue 6 §2: a total observed as zero never fluctuates', () => {
	it('ten counts per basis of d = 8, all on the diagonal, do not certify 8', () => {
		for (const method of ['mub-correlation', 'fidelity-two-basis', 'steering-2mub'] as const) {
			const r = certify(diagonalOnly(8, 10), { method });
			expect(r.certifiedSchmidtNumber).toBeLessThan(8);
		}
	});

	it('20 counts per basis that landed on the diagonal: bounded by the exact 20-of-20 limit', () => {
		// Φ_7 in d = 8 (Schmidt number 7): basis 0 lands on the 7 first diagonal cells.
		for (const method of ['mub-correlation', 'steering-2mub'] as const) {
			const r = certify(diagonalOnly(8, 20, 7), { method });
			expect(r.certifiedSchmidtNumber).toBeLessThanOrEqual(7);
			// Exact one-sided limit of 20 of 20 at 0.99865: 0.00135^(1/20) = 0.72 per basis
			// (Clopper & Pearson 1934); with the other basis at most 1 the sum's bound is ≤ 1.72.
			expect(r.statistic.lower).toBeLessThan(1 + 0.00135 ** (1 / 20));
		}
	});
});

describe('issue 6 §3: coverage at low counts near the top of the ladder', () => {
	it('Φ_7 in d = 8 at 20 counts per basis certifies 8 within the allowance', () => {
		const experiments = 300;
		for (const method of ['mub-correlation', 'steering-2mub'] as const) {
			let wrong = 0;
			for (let e = 0; e < experiments; e++) {
				const data = sampledCounts(states.rankLimited(8, 7), [0, 1], 20, 3000 + e);
				const r = certify(data, { method, resamples: 1000, seed: e + 1 });
				if (r.certifiedSchmidtNumber > 7) wrong++;
			}
			expect(wrong).toBeLessThanOrEqual(allowance(1 - 0.99865, experiments));
		}
	});
});

describe('issue 6 §4: data no quantum state could give', () => {
	it('1000 counts in cell (0, 0) of bases 0 and 1 in d = 8 are refused, naming side and bases', () => {
		const tables = [0, 1].map((basis) => {
			const counts = new Float64Array(64);
			counts[0] = 1000;
			return table(basis, counts);
		});
		for (const method of ['mub-correlation', 'steering-2mub', 'fidelity-two-basis'] as const) {
			expect(() => certify({ dimension: 8, tables }, { method })).toThrow(
				/side [AB]: outcome 0 in basis 0 and outcome 0 in basis 1/
			);
		}
	});
});
