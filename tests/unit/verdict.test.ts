import { describe, expect, it } from 'vitest';
import { certify, expectedCounts, states } from '../../src/lib/certify';
import { countsAdvice } from '../../src/lib/certify/planner/check-counts';

describe('verdict on a claim (witnesses.md §5)', () => {
	it('supports a claim at or below the certified Schmidt number', () => {
		const r = certify(expectedCounts(states.isotropic(7, 0.95), [0, 1], 1e7), {
			method: 'steering-2mub',
			claim: 3,
			resamples: 2000
		});
		expect(r.certifiedSchmidtNumber).toBeGreaterThanOrEqual(3);
		expect(r.claim).toEqual({ schmidtNumber: 3, verdict: 'supported' });
	});

	/** Tables whose matching fraction is exactly p in bases 0 and 1 (the statistic needs only the totals). */
	function matchingFraction(d: number, p: number, total: number) {
		const tables = [0, 1].map((basis) => {
			// Spread over the cells so that no marginal is impossible for a quantum state (physical.ts).
			const counts = new Float64Array(d * d);
			const diagonal = Math.round(p * total);
			const spread = (sum: number, cells: number[]) =>
				cells.forEach(
					(c, i) => (counts[c] = Math.floor(sum / cells.length) + (i < sum % cells.length ? 1 : 0))
				);
			const cells = Array.from({ length: d * d }, (_, c) => c);
			spread(
				diagonal,
				cells.filter((c) => c % (d + 1) === 0)
			);
			spread(
				total - diagonal,
				cells.filter((c) => c % (d + 1) !== 0)
			);
			return {
				basis,
				counts,
				accidentals: null,
				durations: null,
				present: new Uint8Array(d * d).fill(1)
			};
		});
		return { dimension: d, tables };
	}

	it('when only statistics fall short, the advice after the check names counts that are enough (checked by re-running)', () => {
		// W = 2 × 0.9191 = 1.8382 clears β_4 = 1.83729 in d = 7 at the point value by 9.1e-4, so the
		// counts needed are many times the data's (×30 or more): a cap on that factor hides the figure.
		const data = matchingFraction(7, 0.9191, 200_000);
		const options = { method: 'steering-2mub', claim: 5, resamples: 4000 };
		const few = certify(data, options);
		expect(few.pointSchmidtNumber).toBe(5);
		expect(few.claim!.verdict).toBe('not supported');
		expect(few.claim!.moreCountsHelp).toBe(true);
		const advice = countsAdvice(data, options, few)!;
		const needed = advice.totalCounts!;
		expect(needed).toBeGreaterThan(few.totalCounts);
		expect(advice.factor).toBeCloseTo(needed / few.totalCounts, 12);
		const perBasis = (factor: number) => Math.round((factor * needed) / 2 / 10_000) * 10_000;
		const enough = certify(matchingFraction(7, 0.9191, perBasis(1.3)), options);
		expect(enough.claim!.verdict).toBe('supported');
		// The figure is for 90 % power, about twice what the point value alone needs (z_α + z_0.9 against
		// z_α): at 0.4× even the expected tables fall short.
		expect(advice.power).toBeGreaterThanOrEqual(0.9);
		const short = certify(matchingFraction(7, 0.9191, perBasis(0.4)), options);
		expect(short.claim!.verdict).toBe('not supported');
	});

	it('the verdict itself simulates nothing: issuing and the verifiers re-run certify without the advice', () => {
		const data = matchingFraction(7, 0.9191, 200_000);
		const r = certify(data, { method: 'steering-2mub', claim: 5, resamples: 4000 });
		expect(r.claim!.verdict).toBe('not supported');
		expect(r.claim!.moreCountsHelp).toBe(true);
		expect(Object.keys(r.claim!)).not.toContain('countsNeeded');
		expect(Object.keys(r.claim!)).not.toContain('powerAtCountsNeeded');
		expect(r.claim!.shortfall).toMatch(/simulated once the check is done/);
		// A supported claim, or one more counts cannot help, has no advice to simulate.
		const supported = certify(data, { method: 'steering-2mub', claim: 4, resamples: 4000 });
		expect(supported.claim!.verdict).toBe('supported');
		expect(countsAdvice(data, { method: 'steering-2mub', claim: 4 }, supported)).toBeNull();
	});

	it('when the point value is below the bound, it names the visibility needed and no counts', () => {
		const r = certify(expectedCounts(states.isotropic(5, 0.8), [0, 1, 2], 1e8), {
			method: 'mub-correlation',
			claim: 5,
			resamples: 1000
		});
		expect(r.claim!.verdict).toBe('not supported');
		expect(r.claim!.moreCountsHelp).toBe(false);
		expect(r.claim!.visibilityNeeded).toBe(r.bounds[3].criticalVisibility);
		// §7: η*_r = (B_r/m − 1/d)/(1 − 1/d) with B_4 = 1 + 2·4/5, m = 3.
		expect(r.claim!.visibilityNeeded).toBeCloseTo(
			((1 + (2 * 4) / 5) / 3 - 1 / 5) / (1 - 1 / 5),
			12
		);
		expect(r.effectiveVisibility).toBeCloseTo(0.8, 6);
		// The same visibility just above the critical one certifies the claim.
		const above = certify(
			expectedCounts(states.isotropic(5, r.claim!.visibilityNeeded! + 0.01), [0, 1, 2], 1e10),
			{ method: 'mub-correlation', claim: 5, resamples: 1000 }
		);
		expect(above.claim!.verdict).toBe('supported');
	});
});

describe('warnings on the result', () => {
	it('say when basis 1 is the field Fourier basis, and that prime d makes the two the same', () => {
		const at = (d: number, fourier: 'cyclic' | 'field') =>
			certify(expectedCounts(states.isotropic(d, 0.9), [0, 1], 1e6, fourier), {
				method: 'fidelity-two-basis',
				fourier,
				resamples: 500
			}).warnings.join(' ');
		expect(at(4, 'field')).toMatch(/Fourier basis of the finite field GF\(4\)/);
		expect(at(9, 'field')).toMatch(/Fourier basis of the finite field GF\(9\)/);
		expect(at(9, 'cyclic')).not.toMatch(/finite field/);
		expect(at(5, 'field')).toMatch(/same bases/);
		expect(at(6, 'cyclic')).not.toMatch(/finite field|same bases/);
	});
});

describe('words on the result (issue 6, §6)', () => {
	it('offers no counts when only F̃, not the floor P₀ + P₁ − 1 it is bounded through, clears the rung', () => {
		// d = 5; basis 0: 0.9 on the diagonal, 0.1 in the single cell (0, 1), so Γ = 0 and
		// F̃ = (P₀ + d·P₁ − 1)/d = 0.88 > B₄ = 0.8 while the floor is P₀ + P₁ − 1 = 0.8 (witnesses.md §4.3).
		const d = 5;
		const n = 2000;
		const c0 = new Float64Array(25);
		for (let a = 0; a < d; a++) c0[a * d + a] = (0.9 * n) / d;
		c0[1] = 0.1 * n;
		const c1 = new Float64Array(25).map((_, c) => (c % 6 === 0 ? (0.9 * n) / d : (0.1 * n) / 20));
		const tables = [c0, c1].map((counts, basis) => ({
			basis,
			counts,
			accidentals: null,
			durations: null,
			present: new Uint8Array(25).fill(1)
		}));
		const r = certify({ dimension: d, tables }, { method: 'fidelity-two-basis', claim: 5 });
		expect(r.statistic.plugInValue).toBeCloseTo(0.88, 12);
		expect(r.statistic.floorValue).toBeCloseTo(0.8, 12);
		expect(r.claim!.verdict).toBe('not supported');
		expect(r.claim!.moreCountsHelp).toBe(false);
		expect(r.claim!.shortfall).toMatch(/cannot be shown to help/);
		expect(r.claim!.shortfall).toMatch(/white-noise threshold visibility/);
	});

	it('says when accidentals are subtracted that their estimates are taken as exact', () => {
		const data = expectedCounts(states.isotropic(5, 0.9), [0, 1], 1e5);
		for (const t of data.tables) t.accidentals = new Float64Array(25).fill(10);
		const r = certify(data, {
			method: 'steering-2mub',
			subtractAccidentals: true,
			resamples: 1500
		});
		expect(r.backgroundSubtracted).toBe(true);
		expect(r.statistic.boundMethod).toBe('garwood-cells-sum');
		expect(r.warnings.join(' ')).toMatch(/taken as exact/);
	});
});
