/**
 * Calibrated bases (witnesses.md §4.4): μ from the Gram matrix, the ladder μ⁺ + (m − μ⁺)·r/d, the
 * calibration tolerance. Check values from §4.4; eigenvalues against mathjs (`eigs`); maxima over
 * states by an independent search (tests/unit/calibrated-states.ts).
 */
import { readFileSync } from 'node:fs';
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { certify, parseCounts } from '../../src/lib/certify';
import {
	calibratedBounds,
	calibratedMu,
	calibrationTolerance,
	gramMatrix,
	largestEigenvalueUpper,
	overlapMatrix,
	parseCalibration,
	type CalibratedBasis
} from '../../src/lib/certify/calibration';
import {
	correlationSumOf,
	exactBasis,
	perturbed,
	searchMaximum,
	uniforms
} from './calibrated-states';

const fixture = (name: string) => readFileSync(`tests/fixtures/${name}`);
const mathjsLargest = (a: Float64Array, n: number) => {
	const rows = Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)));
	return Math.max(...(math.eigs(rows).values as number[]));
};
const calibrationOf = (bases: CalibratedBasis[], d: number, tolerance = 0) => ({
	dimension: d,
	bases,
	tolerance
});
const biasOf = (bases: CalibratedBasis[], d: number) => {
	let worst = 0;
	for (let i = 0; i < bases.length; i++)
		for (let k = i + 1; k < bases.length; k++)
			for (const x of overlapMatrix(bases[i], bases[k], d))
				worst = Math.max(worst, Math.abs(d * x - 1));
	return worst;
};
/** Bases within 1–2 % of unbiased: perturb until the largest bias falls in [0.01, 0.02]. */
function nearlyUnbiased(d: number, ts: number[], random: () => number): CalibratedBasis[] {
	for (let noise = 0.004; ; noise *= 0.97) {
		const bases = ts.map((t) => perturbed(exactBasis(d, t), d, noise, random));
		const bias = biasOf(bases, d);
		if (bias >= 0.01 && bias <= 0.02) return bases;
		if (bias < 0.01) noise /= 0.9;
	}
}

describe('μ of exact mutually unbiased bases is 1: the ladder is §4.1 (witnesses.md §4.4)', () => {
	for (const [d, m] of [
		[3, 2],
		[3, 4],
		[5, 3],
		[5, 6],
		[7, 8]
	]) {
		it(`d = ${d}, m = ${m}`, () => {
			const ts = Array.from({ length: m }, (_, t) => t);
			const { mu, muUpper, muPlus } = calibratedMu(
				calibrationOf(
					ts.map((t) => exactBasis(d, t)),
					d
				),
				ts
			);
			expect(mu).toBeCloseTo(1, 10);
			expect(muUpper).toBeGreaterThanOrEqual(1);
			expect(muUpper - 1).toBeLessThan(1e-7);
			// Spengler et al., Phys. Rev. A 86, 022311 (2012) (r = 1); Morelli, Huber & Tavakoli, PRL 131, 170201 (2023).
			calibratedBounds(muPlus, m, d).forEach((b, i) =>
				expect(b).toBeCloseTo(1 + ((m - 1) * (i + 1)) / d, 6)
			);
		});
	}
});

describe('check values of witnesses.md §4.4', () => {
	it('identical bases give μ = m (bound m: no certificate possible)', () => {
		for (const m of [2, 3]) {
			const d = 4;
			const g = gramMatrix(
				Array.from({ length: m }, () => exactBasis(d, 1)),
				d
			);
			const { upper } = largestEigenvalueUpper(g, m * d);
			expect(upper).toBeCloseTo(m, 8);
			expect(calibratedBounds(m, m, d)).toEqual([m, m, m]);
		}
	});

	it('d = 2, basis 1 the rotation by θ = 0.3: bound (3 + |cos 2θ|)/2 = 1.9126678, the separable maximum', () => {
		const [c, s] = [Math.cos(0.3), Math.sin(0.3)];
		const rotated = { basis: 1, re: Float64Array.from([c, s, -s, c]), im: new Float64Array(4) };
		const bases = [exactBasis(2, 0), rotated];
		const { muPlus } = calibratedMu(calibrationOf(bases, 2), [0, 1]);
		const [b1] = calibratedBounds(muPlus, 2, 2);
		expect(b1).toBeCloseTo((3 + Math.abs(Math.cos(0.6))) / 2, 8);
		expect(b1).toBeCloseTo(1.9126678, 7);
		// Product states |ψ⟩|φ⟩ on a grid of both Bloch spheres: the maximum reaches the bound, never exceeds it.
		let best = 0;
		const ket = (x: number, y: number) => [
			Math.cos(x),
			Math.sin(x) * Math.cos(y),
			Math.sin(x) * Math.sin(y)
		];
		for (let i = 0; i <= 60; i++)
			for (let j = 0; j < 24; j++) {
				const [a0, a1r, a1i] = ket((i / 60) * (Math.PI / 2), (j / 24) * 2 * Math.PI);
				// φ = ψ* is optimal for real bases; Ψ = ψ φᵀ.
				const re = Float64Array.from([a0 * a0, a0 * a1r, a1r * a0, a1r * a1r + a1i * a1i]);
				const im = Float64Array.from([0, -a0 * a1i, a1i * a0, 0]);
				best = Math.max(best, correlationSumOf(bases, 2, re, im));
			}
		expect(best).toBeLessThanOrEqual(b1 + 1e-12);
		expect(best).toBeGreaterThan(b1 - 1e-3);
	});

	it('the d = 3 example: a product state with S = 1.680400 exceeds §4.1’s 1.666667 but not the calibrated bound', () => {
		const calibration = parseCalibration(fixture('calibrated-d3-bases.json'));
		expect(biasOf(calibration.bases, 3)).toBeLessThanOrEqual(0.02);
		// ψ of the fixture's product state |ψ⟩|ψ*⟩ (found by the construction described in the test's report).
		const psi: [number, number][] = [
			[0.9097344743161914, 0],
			[-0.08338962816027987, 0.21399618857109173],
			[-0.21951700402501928, 0.26729622589340507]
		];
		const re = new Float64Array(9);
		const im = new Float64Array(9);
		for (let m = 0; m < 3; m++)
			for (let n = 0; n < 3; n++) {
				// Ψ_mn = ψ_m·conj(ψ_n)
				re[m * 3 + n] = psi[m][0] * psi[n][0] + psi[m][1] * psi[n][1];
				im[m * 3 + n] = psi[m][1] * psi[n][0] - psi[m][0] * psi[n][1];
			}
		const s = correlationSumOf(calibration.bases, 3, re, im);
		expect(s).toBeCloseTo(1.6804, 9);
		expect(s).toBeGreaterThan(1 + 2 / 3);
		const { mu, muPlus } = calibratedMu(calibration, [0, 1, 2]);
		const [b1] = calibratedBounds(muPlus, 3, 3);
		expect(s).toBeLessThan(b1);
		// This construction's μ (numpy eigvalsh: 1.0236138806845; §4.4's own example has 1.681351).
		expect(mu).toBeCloseTo(1.0236138806845, 9);
		expect(b1).toBeCloseTo(1.6824093, 6);
	});
});

describe('the eigenvalue bound against mathjs eigs', () => {
	it('random positive semidefinite matrices (Gram matrices, as G is): above the largest eigenvalue, within 10⁻⁶', () => {
		const random = uniforms(11);
		for (const n of [1, 2, 7, 30]) {
			const x = Array.from({ length: n }, () => Array.from({ length: n }, () => 2 * random() - 1));
			const a = Float64Array.from((math.multiply(math.transpose(x), x) as number[][]).flat());
			const exact = mathjsLargest(a, n);
			const { upper, method } = largestEigenvalueUpper(a, n);
			expect(method).toBe('cholesky-certified');
			expect(upper).toBeGreaterThanOrEqual(exact);
			expect(upper - exact).toBeLessThan(1e-6 * Math.max(1, exact));
		}
	});

	it('any symmetric matrix: still an upper bound (Gershgorin when the power iteration meets a negative eigenvalue)', () => {
		const random = uniforms(12);
		for (const n of [2, 7, 30]) {
			const a = new Float64Array(n * n);
			for (let i = 0; i < n; i++)
				for (let j = 0; j <= i; j++) a[i * n + j] = a[j * n + i] = 2 * random() - 1;
			expect(largestEigenvalueUpper(a, n).upper).toBeGreaterThanOrEqual(mathjsLargest(a, n));
		}
	});

	it('m = 2: μ = 1 + σ₂(D⁰¹) (σ₂ from mathjs eigs of DᵀD)', () => {
		const d = 4;
		const bases = nearlyUnbiased(d, [0, 1], uniforms(5));
		const dm = overlapMatrix(bases[0], bases[1], d);
		const rows = Array.from({ length: d }, (_, i) => Array.from(dm.subarray(i * d, i * d + d)));
		const singular = (
			math.eigs(math.multiply(math.transpose(rows), rows) as number[][]).values as number[]
		)
			.map((x) => Math.sqrt(Math.max(0, x)))
			.sort((x, y) => y - x);
		const { mu, muUpper } = calibratedMu(calibrationOf(bases, d), [0, 1]);
		expect(mu).toBeCloseTo(1 + singular[1], 8);
		expect(muUpper).toBeGreaterThanOrEqual(1 + singular[1] - 1e-12);
	});

	it('m = 3, d = 5: μ is mathjs’s largest eigenvalue of G; μ ≤ 1 + (m − 1)·max bias (Weyl)', () => {
		const d = 5;
		const bases = nearlyUnbiased(d, [0, 1, 2], uniforms(6));
		const exact = mathjsLargest(gramMatrix(bases, d), 3 * d);
		const { muUpper } = calibratedMu(calibrationOf(bases, d), [0, 1, 2]);
		expect(muUpper).toBeGreaterThanOrEqual(exact);
		expect(muUpper - exact).toBeLessThan(1e-6);
		expect(muUpper).toBeLessThanOrEqual(1 + 2 * biasOf(bases, d) + 1e-9);
	});

	it('ε adds (m − 1)·d·ε, capped at m', () => {
		const d = 3;
		const bases = [0, 1, 2].map((t) => exactBasis(d, t));
		expect(calibratedMu(calibrationOf(bases, d, 0.01), [0, 1, 2]).muPlus).toBeCloseTo(
			1 + 2 * 3 * 0.01,
			7
		);
		expect(calibratedMu(calibrationOf(bases, d, 0.1), [0, 1, 2]).muPlus).toBeCloseTo(1 + 0.6, 7);
	});
});

describe('random bases within 1–2 % of unbiased: no state of Schmidt number ≤ r exceeds the calibrated bound', () => {
	for (const [d, ts, seed] of [
		[3, [0, 1, 2], 21],
		[3, [0, 1, 2, 3], 22],
		[4, [0, 1], 23],
		[5, [0, 1, 2], 24]
	] as const) {
		it(`d = ${d}, bases ${ts.join(',')}`, () => {
			const random = uniforms(seed);
			const bases = nearlyUnbiased(d, [...ts], random);
			const { muPlus } = calibratedMu(calibrationOf(bases, d), [...ts]);
			const ladder = calibratedBounds(muPlus, ts.length, d);
			for (let r = 1; r < d; r++) {
				const found = searchMaximum(bases, d, r, random, 4, 1200);
				expect(found).toBeLessThanOrEqual(ladder[r - 1] + 1e-9);
				// The search gets close to the bound (it is tight for exact MUBs): a search that finds nothing proves nothing.
				expect(found).toBeGreaterThan(ladder[r - 1] - 0.05);
			}
		});
	}
});

describe('the calibration tolerance (witnesses.md §4.4)', () => {
	it('at μ = 1 + (m − 1)·δ the certified rung’s bound equals the lower bound exactly', () => {
		const [d, m, lower] = [7, 4, 2.9];
		const tol = calibrationTolerance({
			method: 'mub-correlation',
			lower,
			certified: 5,
			m,
			d,
			calibrated: false
		})!;
		const mu = 1 + (m - 1) * tol.value!;
		expect(calibratedBounds(mu, m, d)[5 - 2]).toBeCloseTo(lower, 12);
		expect(tol.note).toMatch(/holds for bases unbiased to within \d/);
	});

	it('the steering test says side B’s tolerance is not computed, and why', () => {
		const tol = calibrationTolerance({
			method: 'steering-2mub',
			lower: 1.9,
			certified: 3,
			m: 2,
			d: 7,
			calibrated: false
		})!;
		expect(tol.value).toBeNull();
		expect(tol.note).toMatch(/not computed/);
	});

	it('the d = 3 example: certified today with a tolerance below 0.02; with its calibration nothing', () => {
		const counts = parseCounts(fixture('calibrated-d3-product.csv'), 3);
		const plain = certify(counts, { method: 'mub-correlation', resamples: 2000 });
		expect(plain.statistic.value).toBeCloseTo(1.6804, 4);
		expect(plain.certifiedSchmidtNumber).toBe(2);
		expect(plain.calibrationTolerance!.value!).toBeGreaterThan(0);
		expect(plain.calibrationTolerance!.value!).toBeLessThan(0.02);
		const calibration = parseCalibration(fixture('calibrated-d3-bases.json'));
		const calibrated = certify(counts, { method: 'mub-correlation', resamples: 2000, calibration });
		expect(calibrated.certifiedSchmidtNumber).toBe(1);
		expect(calibrated.calibration!.muPlus).toBeCloseTo(1.0236139, 6);
		expect(calibrated.bounds[0].bound).toBeCloseTo(1.6824093, 6);
	});
});

describe('the calibration file: refusals name the field or the basis', () => {
	const good = () => JSON.parse(fixture('calibrated-d3-bases.json').toString());
	const refuse = (edit: (x: any) => void, pattern: RegExp) => {
		const x = good();
		edit(x);
		expect(() => {
			const c = parseCalibration(JSON.stringify(x));
			calibratedMu(c, [0, 1, 2]);
		}).toThrow(pattern);
	};
	it('bad shapes and values', () => {
		refuse((x) => (x.tolerance = -1), /\$\.tolerance/);
		refuse(
			(x) => (x.bases[1].vectors[2][1] = [1]),
			/\$\.bases\[1\]\.vectors\[2\]\[1\]: expected \[re, im\]/
		);
		refuse((x) => x.bases[2].vectors.pop(), /\$\.bases\[2\]\.vectors: expected 3 vectors/);
		refuse((x) => (x.bases[2].basis = 0), /\$\.bases\[2\]\.basis: basis 0 is given twice/);
		refuse((x) => (x.extra = 1), /\$\.extra: unknown field/);
		expect(() => parseCalibration('{', 3)).toThrow(/not valid JSON/);
	});
	it('vectors that are not orthonormal within ε, naming the basis; a missing basis', () => {
		refuse((x) => (x.bases[1].vectors[0][0][0] += 0.001), /calibration basis 1: not orthonormal/);
		refuse((x) => x.bases.pop(), /basis 2 is used by the check but not calibrated/);
	});
	it('the steering test and the fidelity method take no calibration', () => {
		const counts = parseCounts(fixture('calibrated-d3-product.csv'), 3);
		const calibration = parseCalibration(fixture('calibrated-d3-bases.json'));
		expect(() => certify(counts, { method: 'steering-2mub', bases: [0, 1], calibration })).toThrow(
			/no proven bound/
		);
	});
});

describe('the refusal test for data no quantum state gives uses the calibrated overlaps', () => {
	// d = 2, basis 1 the rotation by θ = 0.3 of basis 0, state |00⟩: P₀(0) + P₁(0) = 1 + cos² 0.3 = 1.913,
	// above 1 + 1/√2 for unbiased bases but below 1 + |⟨0|0_θ⟩| = 1 + cos 0.3 (Maassen & Uffink, PRL 60, 1103 (1988)).
	const [c, s] = [Math.cos(0.3), Math.sin(0.3)];
	const rotated = { basis: 1, re: Float64Array.from([c, s, -s, c]), im: new Float64Array(4) };
	const calibration = { dimension: 2, bases: [exactBasis(2, 0), rotated], tolerance: 0 };
	const q = [c * c, s * s];
	const rows = [
		'basis,outcome_a,outcome_b,counts',
		'0,0,0,100000',
		'0,0,1,0',
		'0,1,0,0',
		'0,1,1,0'
	];
	for (let a = 0; a < 2; a++)
		for (let b = 0; b < 2; b++) rows.push(`1,${a},${b},${Math.round(100000 * q[a] * q[b])}`);
	const counts = parseCounts(rows.join('\n') + '\n', 2);
	it('refused as declared (unbiased bases), accepted with the calibration', () => {
		expect(() => certify(counts, { method: 'mub-correlation', resamples: 1000 })).toThrow(
			/too frequent for any quantum state measured in these unbiased bases/
		);
		const r = certify(counts, { method: 'mub-correlation', resamples: 1000, calibration });
		expect(r.certifiedSchmidtNumber).toBe(1);
		expect(r.bounds[0].bound).toBeCloseTo(1.9126678, 7);
	});
});
