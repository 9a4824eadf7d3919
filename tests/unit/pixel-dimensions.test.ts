/**
 * Pixel-scale dimensions (issue 19, part 4): d up to 1 024 for every method, read from the JSON
 * form, certified, and shown as heat maps summed in blocks.
 */
import { describe, expect, it } from 'vitest';
import {
	certify,
	MAX_DIMENSION,
	parseCounts,
	resamplesCeiling,
	witnessFamilies,
	type MethodId
} from '../../src/lib/certify';
import { isotropicCounts, toCountsJson } from '../../src/lib/certify/planner/white-counts';
import { blockSums, PREVIEW_SIDE } from '../../src/lib/server/checks/summary';

describe('d = 1 024', () => {
	const d = 1024;
	const eta = 0.9;
	const data = parseCounts(
		new TextEncoder().encode(toCountsJson(isotropicCounts(d, eta, [0, 1], 1e7, 5))),
		d
	);

	it('is the dimension limit', () => {
		expect(MAX_DIMENSION).toBe(1024);
		expect(data.tables.map((t) => t.basis)).toEqual([0, 1]);
	});

	for (const method of ['mub-correlation', 'steering-2mub', 'fidelity-two-basis'] as MethodId[]) {
		it(`${method}: certifies what the white-noise model says, never above the state's`, () => {
			const resamples = resamplesCeiling(d, 2);
			const r = certify(data, { method, resamples });
			// S = 2(η + (1 − η)/d) for two MUBs (witnesses.md §7); certified = 1 + #{r : L > B_r}.
			const s = 2 * (eta + (1 - eta) / d);
			const bounds = witnessFamilies[method].bounds(d, [0, 1]);
			const atTruth =
				1 + bounds.filter((b) => (method === 'fidelity-two-basis' ? s - 1 : s) > b).length;
			// SN(ρ_η) = ⌈d·F⌉, F = η + (1 − η)/d² (Terhal & Horodecki, Phys. Rev. A 61, 040301(R) (2000)).
			const schmidt = Math.ceil(d * (eta + (1 - eta) / d ** 2));
			expect(r.certifiedSchmidtNumber).toBeLessThanOrEqual(Math.min(atTruth, schmidt));
			expect(r.certifiedSchmidtNumber).toBeGreaterThanOrEqual(atTruth - 3);
		});
	}
});

describe('heat maps of large tables', () => {
	it('sum b × b blocks to at most PREVIEW_SIDE cells a side, keeping every count', () => {
		const d = 1000;
		const counts = new Float64Array(d * d).map((_, c) => (c % 7) + (c % (d + 1) === 0 ? 50 : 0));
		const { counts: rows, block } = blockSums(counts, d);
		expect(block).toBe(4);
		expect(rows.length).toBe(Math.ceil(d / 4));
		expect(rows.length).toBeLessThanOrEqual(PREVIEW_SIDE);
		const total = counts.reduce((s, c) => s + c, 0);
		expect(rows.flat().reduce((s, c) => s + c, 0)).toBe(total);
		// The diagonal blocks hold the diagonal: block (0, 0) has cells (0..3, 0..3).
		let first = 0;
		for (let a = 0; a < 4; a++) for (let b = 0; b < 4; b++) first += counts[a * d + b];
		expect(rows[0][0]).toBe(first);
		expect(blockSums(counts.subarray(0, 64 * 64), 64).block).toBe(1);
	});
});
