/**
 * The fidelity bound profits from structured noise (issue 19, part 2) and gives up nothing against
 * the two-basis correlation sum where its cell limits cannot certify (engine 3.2.0: the floor then
 * takes the whole error), and elsewhere at most the band between the sum's bounds at α and at
 * (1 − 2⁻¹⁶)·α (docs/statistics.md §2, §14). The state: Φ_d mixed with cross-talk in which one
 * mode leaks into its neighbour (simulate-tables.ts `crossTalk`): F̃ = F = v (witnesses.md §4.3,
 * Bavaresco et al., Nat. Phys. 14, 1032 (2018)), while the floor P₀ + P₁ − 1 is 2v − 1 + (1 − v)/d.
 */
import { describe, expect, it } from 'vitest';
import { certify, states, witnessFamilies, type CountsDataset } from '../../src/lib/certify';
import { fidelityCellCeiling, fidelityCellLimits } from '../../src/lib/certify/fidelity-limits';
import { CELL_SHARE, cellShare } from '../../src/lib/certify/statistic-bound';
import {
	crossTalk,
	sampleTables,
	separableFourierCorrelated,
	simulatedState,
	type TableState
} from '../../src/lib/certify/simulate-tables';
import { missAllowance, runCoverage } from '../../scripts/coverage-run';

const both = (data: CountsDataset, confidence: number, resamples: number, seed: number) =>
	(['fidelity-two-basis', 'mub-correlation'] as const).map(
		(method) =>
			certify(data, { method, bases: [0, 1], confidence, resamples, seed }).certifiedSchmidtNumber
	);

describe('cross-talk near the diagonal, d = 4, v = 0.85', () => {
	const state = crossTalk(4, 0.85);
	it('has F̃ = F = 0.85 > 3/4 while the floor 2v − 1 + (1 − v)/d = 0.7375 is below it', () => {
		const [p0, p1] = [state.table(0), state.table(1)];
		let [d0, d1] = [0, 0];
		for (let a = 0; a < 4; a++) [d0, d1] = [d0 + p0[a * 5], d1 + p1[a * 5]];
		expect(d0 + d1 - 1).toBeCloseTo(0.7375, 12);
		expect(state.fidelity).toBe(0.85);
	});

	for (const counts of [1e4, 1e5, 1e6]) {
		it(`${counts} counts per basis: the fidelity method certifies 4, the correlation sum 3`, () => {
			for (let i = 0; i < 3; i++) {
				const data = sampleTables(state, [0, 1], counts, 40 + i);
				const [fidelity, sum] = both(data, 0.99865, 2000, i + 1);
				// S = 2v + (1 − v)/d = 1.7375 < 1 + 3/4 (Spengler et al., Phys. Rev. A 86, 022311 (2012)).
				expect(sum).toBe(3);
				// F = 0.85 > 3/4 (Terhal & Horodecki, Phys. Rev. A 61, 040301(R) (2000)).
				expect(fidelity).toBe(4);
			}
		});
	}
});

const fidelityFamily = witnessFamilies['fidelity-two-basis'];
const shareAt = (data: CountsDataset, confidence: number) =>
	cellShare({ tables: data.tables, d: data.dimension, confidence, perCell: false }, (p) =>
		fidelityFamily.statistic(p, data.dimension, [0, 1], 'cyclic')
	);

const whiteNoiseTable: TableState[] = [
	separableFourierCorrelated(13),
	simulatedState('Φ3 d=7', states.rankLimited(7, 3)),
	simulatedState('iso d=11', states.isotropic(11, 0.8)),
	simulatedState('0.9·Φ4 + white d=8', states.rankLimited(8, 4, 0.9)),
	crossTalk(7, 0.9, 3)
];

describe('where the cell limits cannot certify, the very bound of the correlation sum', () => {
	it('at 20 and 100 counts per basis in d = 7 to 13: the same lower bound and the same rung', () => {
		let compared = 0;
		for (const state of whiteNoiseTable)
			for (const counts of [20, 100])
				for (const confidence of [0.9, 0.99865])
					for (let i = 0; i < 6; i++) {
						const data = sampleTables(state, [0, 1], counts, 700 + i);
						expect(shareAt(data, confidence)).toBe(0);
						const [fidelity, sum] = (['fidelity-two-basis', 'mub-correlation'] as const).map(
							(method) => certify(data, { method, bases: [0, 1], confidence, seed: i + 1 })
						);
						// F̃ ≥ P₀ + P₁ − 1 (Cauchy–Schwarz, docs/statistics.md §2): the floor is S − 1.
						expect(fidelity.statistic.lower + 1).toBeCloseTo(sum.statistic.lower, 12);
						expect(fidelity.statistic.boundMethod).toBe('fidelity-floor');
						expect(fidelity.certifiedSchmidtNumber, `${state.label}, ${counts}`).toBe(
							sum.certifiedSchmidtNumber
						);
						compared++;
					}
		expect(compared).toBe(120);
	});
});

describe('the cell limits’ ceiling (statistic-bound.ts cellShare)', () => {
	// The lemma the share rests on: at fixed totals no table gives the cell limits more than the
	// table with every count matching. Checked against tables built to favour the cells: all the
	// mismatches in one cell (the least Γ for their total), and sampled cross-talk.
	const d = 7;
	const stat = (p: Float64Array[]) => fidelityFamily.statistic(p, d, [0, 1], 'cyclic');
	const table = (counts: Float64Array) => ({ counts }) as CountsDataset['tables'][number];
	it('is never exceeded by a table with the same totals', () => {
		for (const total of [30, 600, 5000])
			for (const mismatches of [0, 1, 3, Math.floor(total / 10), Math.floor(total / 2)]) {
				const c0 = new Float64Array(d * d);
				const c1 = new Float64Array(d * d);
				c0[0] = total - mismatches;
				c0[1] = mismatches;
				c1[0] = total;
				const tables = [table(c0), table(c1)];
				const ceiling = fidelityCellCeiling(tables, d, 1e-4, stat);
				expect(fidelityCellLimits(tables, d, 1e-4, stat)).toBeLessThanOrEqual(ceiling);
				if (mismatches > 0) expect(fidelityCellLimits(tables, d, 1e-4, stat)).toBeLessThan(ceiling);
			}
		for (let i = 0; i < 20; i++) {
			const data = sampleTables(crossTalk(d, 0.9), [0, 1], 2000, 300 + i);
			const ceiling = fidelityCellCeiling(data.tables, d, 1e-4, stat);
			expect(fidelityCellLimits(data.tables, d, 1e-4, stat)).toBeLessThan(ceiling);
		}
	});
	it('switches the cells on only where they could clear the first rung 1/d', () => {
		// 20 counts in d = 7: Γ of the zero-count limits alone, 7·6²·u_min with u_min ≈ 0.67, sinks
		// the ceiling far below 1/7; at 10⁴ counts the ceiling is near 1.
		const low = sampleTables(crossTalk(d, 0.9), [0, 1], 20, 1);
		const high = sampleTables(crossTalk(d, 0.9), [0, 1], 10_000, 1);
		expect(shareAt(low, 0.99865)).toBe(0);
		expect(shareAt(high, 0.99865)).toBe(CELL_SHARE);
		expect(fidelityCellCeiling(low.tables, d, 0.00135 * CELL_SHARE, stat)).toBeLessThan(1 / d);
	});
});

/** The correlation sum at the error the fidelity floor spends when the cells take their share. */
const floorLevel = (confidence: number) => 1 - (1 - confidence) * (1 - CELL_SHARE);

describe('where the cells take their share, never less than the sum at the floor’s error', () => {
	it('on every data set, at 10³ and 10⁴ counts, at both confidences', () => {
		let compared = 0;
		for (const state of whiteNoiseTable)
			for (const counts of [1000, 10_000])
				for (const [confidence, resamples] of [
					[0.9, 400],
					[0.99865, 1500]
				])
					for (let i = 0; i < 4; i++) {
						const data = sampleTables(state, [0, 1], counts, 900 + i);
						const [fidelity] = both(data, confidence, resamples, 5 + i);
						const [, sum] = both(data, floorLevel(confidence), resamples, 5 + i);
						expect(fidelity, `${state.label}, ${counts}, ${confidence}`).toBeGreaterThanOrEqual(
							sum
						);
						compared++;
					}
		expect(compared).toBe(80);
	});
});

describe('soundness on the cross-talk state at its boundary (F̃ = F = 6/7)', () => {
	const state = crossTalk(7, 6 / 7);
	for (const countsPerBasis of [100, 100_000]) {
		it(`${countsPerBasis} per basis: misses within nominal at 0.9 and 0.99865`, () => {
			for (const [confidence, experiments, resamples] of [
				[0.9, 150, 400],
				[0.99865, 300, 1500]
			]) {
				const o = runCoverage(
					{ method: 'fidelity-two-basis', bases: [0, 1], state },
					{ countsPerBasis, confidence, experiments, resamples, firstSeed: 11 }
				);
				const limit = missAllowance(1 - confidence, experiments - o.refused);
				expect(o.refused).toBe(0);
				expect(o.misses).toBeLessThanOrEqual(limit);
				expect(o.missesOfFidelity).toBeLessThanOrEqual(limit);
			}
		});
	}
});

describe('soundness where the totals switch the cell limits on and off', () => {
	// Poisson totals around the switch (d = 7: 776 counts per basis at 0.9, 961 at 0.99865, from
	// cellShare): the share follows the totals alone, so each experiment is judged at its own split.
	const state = crossTalk(7, 6 / 7);
	for (const [confidence, countsPerBasis, experiments, resamples] of [
		[0.9, 776, 200, 400],
		[0.99865, 961, 300, 1500]
	]) {
		it(`${countsPerBasis} per basis at ${confidence}: both splits occur, misses within nominal`, () => {
			let switchedOn = 0;
			for (let e = 0; e < experiments; e++)
				if (shareAt(sampleTables(state, [0, 1], countsPerBasis, 21 + e), confidence) > 0)
					switchedOn++;
			expect(switchedOn).toBeGreaterThan(experiments / 5);
			expect(switchedOn).toBeLessThan((experiments * 4) / 5);
			const o = runCoverage(
				{ method: 'fidelity-two-basis', bases: [0, 1], state },
				{ countsPerBasis, confidence, experiments, resamples, firstSeed: 21 }
			);
			const limit = missAllowance(1 - confidence, experiments - o.refused);
			expect(o.misses).toBeLessThanOrEqual(limit);
			expect(o.missesOfFidelity).toBeLessThanOrEqual(limit);
			expect(o.paired?.fewer).toBe(0);
		});
	}
});
