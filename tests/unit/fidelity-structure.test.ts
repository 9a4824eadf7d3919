/**
 * The fidelity bound profits from structured noise (issue 19, part 2) and never certifies less than
 * the two-basis correlation sum on the same data at the error its floor spends (7/8 of α, engine
 * 3.0.0: the cell limits take the other eighth; docs/statistics.md §2). The state: Φ_d mixed with cross-talk in which one
 * mode leaks into its neighbour (simulate-tables.ts `crossTalk`): F̃ = F = v (witnesses.md §4.3,
 * Bavaresco et al., Nat. Phys. 14, 1032 (2018)), while the floor P₀ + P₁ − 1 is 2v − 1 + (1 − v)/d.
 */
import { describe, expect, it } from 'vitest';
import { certify, states, type CountsDataset } from '../../src/lib/certify';
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

/** The correlation sum at the error the fidelity floor spends: 7/8 of α (statistic-bound.ts). */
const floorLevel = (confidence: number) => 1 - ((1 - confidence) * 7) / 8;

describe('never less than the correlation sum on the same two bases at the floor’s error', () => {
	const table: TableState[] = [
		separableFourierCorrelated(13),
		simulatedState('Φ3 d=7', states.rankLimited(7, 3)),
		simulatedState('iso d=11', states.isotropic(11, 0.8)),
		simulatedState('0.9·Φ4 + white d=8', states.rankLimited(8, 4, 0.9)),
		crossTalk(7, 0.9, 3)
	];
	it('on every data set, at 20 to 10⁴ counts, at both confidences', () => {
		let compared = 0;
		for (const state of table)
			for (const counts of [20, 100, 1000, 10_000])
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
		expect(compared).toBe(160);
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
