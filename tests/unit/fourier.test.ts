/**
 * The Fourier convention (issue 6 §5, witnesses.md §2 and §4.3): cyclic ℤ_d transform by default,
 * the GF(p^s) basis on request; the fidelity bound pairs cells in the matching group.
 */
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
	availableBases,
	basisVectors,
	largestOverlapError,
	labelDifference,
	outcomeLabels
} from '../../src/lib/certify/bases';
import {
	certify,
	expectedCounts,
	InputError,
	outcomeProbabilities,
	parseCounts,
	states,
	witnessFamilies
} from '../../src/lib/certify';
import {
	countsJson,
	directFidelityBound,
	exactTables,
	expectation,
	maximallyEntangled,
	projector,
	pureTables,
	sparseState,
	stateNearPhi,
	type Convention
} from './exact-states';

const family = witnessFamilies['fidelity-two-basis'];

describe('cyclic Fourier basis in every dimension (witnesses.md §2)', () => {
	// |⟨i_s|j_t⟩|² = 1/d between the computational and the ℤ_d Fourier basis: common practice
	// (the DFT matrix is unitary with entries of modulus d^{-1/2}).
	for (const d of [4, 6, 8, 9, 10]) {
		it(`d = ${d}: bases 0 and 1 are unbiased and orthonormal; basis 1 is d^{-1/2} Σ ω^{jm}|m⟩`, () => {
			expect(largestOverlapError(d, [0, 1], 'cyclic')).toBeLessThan(1e-12);
			const { re, im } = basisVectors(d, 1, 'cyclic');
			for (let j = 0; j < d; j++)
				for (let m = 0; m < d; m++) {
					const angle = (2 * Math.PI * j * m) / d;
					expect(re[j * d + m]).toBeCloseTo(Math.cos(angle) / Math.sqrt(d), 12);
					expect(im[j * d + m]).toBeCloseTo(Math.sin(angle) / Math.sqrt(d), 12);
				}
		});
	}

	it('is the default, and in d = p^s, s ≥ 2 only bases 0 and 1 exist under it', () => {
		for (const d of [4, 8, 9, 16, 25, 27]) {
			expect(availableBases(d)).toEqual([0, 1]);
			expect(availableBases(d, 'field')).toHaveLength(d + 1);
		}
		expect(() => basisVectors(9, 2)).toThrow(/basis 2 in d = 9 exists only with fourier=field/);
	});

	it('differs from the field basis in d = 4, 8, 9 (so the convention matters there)', () => {
		for (const d of [4, 8, 9]) {
			const cyclic = basisVectors(d, 1, 'cyclic');
			const field = basisVectors(d, 1, 'field');
			expect(Math.max(...cyclic.im.map((x, i) => Math.abs(x - field.im[i])))).toBeGreaterThan(0.1);
		}
	});

	it('for prime d the two conventions give the same vectors for every basis', () => {
		for (const d of [2, 3, 5, 7]) {
			expect(availableBases(d, 'cyclic')).toEqual(availableBases(d, 'field'));
			for (const t of availableBases(d)) {
				const a = basisVectors(d, t, 'cyclic');
				const b = basisVectors(d, t, 'field');
				for (let i = 0; i < d * d; i++) {
					expect(a.re[i]).toBeCloseTo(b.re[i], 14);
					expect(a.im[i]).toBeCloseTo(b.im[i], 14);
				}
			}
		}
	});

	it('field exists only for prime powers', () => {
		expect(availableBases(6, 'field')).toEqual([]);
		expect(() => basisVectors(6, 1, 'field')).toThrow(/prime-power dimension/);
	});

	it('names outcomes by base-p digits under field (heat-map labels), 0..d−1 otherwise', () => {
		// 9 = 3²: 5 = 1·3 + 2 → "12"; 8 = 2³: 6 = 1·4 + 1·2 + 0 → "110" (positional base p).
		expect(outcomeLabels(9, 'field')).toEqual([
			'00',
			'01',
			'02',
			'10',
			'11',
			'12',
			'20',
			'21',
			'22'
		]);
		expect(outcomeLabels(8, 'field')[6]).toBe('110');
		expect(outcomeLabels(9, 'cyclic')).toEqual(['0', '1', '2', '3', '4', '5', '6', '7', '8']);
		expect(outcomeLabels(7, 'field')).toEqual(outcomeLabels(7, 'cyclic'));
	});

	it('pairs cells mod d (cyclic) or digit-wise mod p (field)', () => {
		// 9 = 3²: 4 − 2 = 2 in ℤ_9; digits (1,1) − (2,0) = (2,1) → 2 + 3·1 = 5 in (ℤ_3)².
		expect(labelDifference(9, 'cyclic')(4, 2)).toBe(2);
		expect(labelDifference(9, 'field')(4, 2)).toBe(5);
		expect(labelDifference(9, 'cyclic')(2, 4)).toBe(7);
	});
});

describe('cyclic pairing against the published formula (Bavaresco et al., Nat. Phys. 14, 1032 (2018))', () => {
	// Tables from mathjs (exact-states.ts), bound written out directly; the engine must agree.
	for (const d of [4, 8, 9]) {
		it(`d = ${d}: engine F̃ = direct F̃ on exact tables, and the counts path agrees`, () => {
			for (const [seed, w] of [
				[11, 0.9],
				[12, 0.6]
			]) {
				const p = exactTables(stateNearPhi(d, seed, w), d, 'cyclic');
				const direct = directFidelityBound(p, d, 'cyclic');
				expect(family.statistic(p, d, [0, 1], 'cyclic')).toBeCloseTo(direct, 12);
				const data = parseCounts(countsJson(p, d, 1e12), d);
				const result = certify(data, { method: 'fidelity-two-basis', resamples: 200 });
				expect(result.fourier).toBe('cyclic');
				expect(result.statistic.plugInValue).toBeCloseTo(direct, 6);
			}
		});
	}

	it('the simulator measures in the cyclic basis: its tables equal the mathjs ones in d = 8', () => {
		const d = 8;
		const eta = 0.7;
		// ρ_η = η Φ_d + (1 − η) 𝟙/d² (witnesses.md §7).
		const rho = math.add(
			math.multiply(projector(maximallyEntangled(d)), eta),
			math.multiply(math.identity(d * d), (1 - eta) / (d * d))
		) as math.Matrix;
		const p = exactTables(rho, d, 'cyclic');
		for (const t of [0, 1]) {
			const sim = outcomeProbabilities(states.isotropic(d, eta), t, 'cyclic');
			for (let c = 0; c < d * d; c++) expect(sim[c]).toBeCloseTo(p[t][c], 12);
		}
	});
});

describe('F̃ ≤ F on random states near Φ_d (Cauchy–Schwarz argument of witnesses.md §4.3)', () => {
	// F = ⟨Φ_d|ρ|Φ_d⟩ computed directly with mathjs. Sparse pure states are where a pairing in the
	// wrong group shows: each block also checks that the other convention's pairing fails there.
	for (const d of [4, 9])
		for (const convention of ['cyclic', 'field'] as Convention[]) {
			it(`d = ${d}, ${convention} basis and pairing`, () => {
				const phi = maximallyEntangled(d);
				for (let seed = 1; seed <= (d === 4 ? 8 : 2); seed++) {
					const rho = stateNearPhi(d, seed * 7919, [0.5, 0.9, 0.99][seed % 3], d === 4 ? 16 : 3);
					const p = exactTables(rho, d, convention);
					const tilde = family.statistic(p, d, [0, 1], convention);
					expect(tilde).toBeCloseTo(directFidelityBound(p, d, convention), 12);
					expect(tilde).toBeLessThanOrEqual(expectation(rho, phi) + 1e-12);
				}
				const other = convention === 'cyclic' ? 'field' : 'cyclic';
				let wrongExcess = 0;
				for (let seed = 1; seed <= 40; seed++) {
					const psi = sparseState(d, seed);
					const p = pureTables(psi, d, convention);
					const fidelity = expectation(projector(psi), phi);
					expect(family.statistic(p, d, [0, 1], convention)).toBeLessThanOrEqual(fidelity + 1e-12);
					wrongExcess = Math.max(wrongExcess, family.statistic(p, d, [0, 1], other) - fidelity);
				}
				expect(wrongExcess).toBeGreaterThan(0.01);
			});
		}
});

describe('product states measured with the cyclic transform (issue 6 §5)', () => {
	it('|00⟩ in d = 8 gives F̃ = 1/8 exactly and certifies nothing', () => {
		const data = expectedCounts(states.spectrum(8, [1]), [0, 1], 100_000, 'cyclic');
		const result = certify(data, { method: 'fidelity-two-basis', fourier: 'cyclic' });
		expect(result.statistic.plugInValue).toBeCloseTo(1 / 8, 12);
		expect(result.pointSchmidtNumber).toBe(1);
		expect(result.certifiedSchmidtNumber).toBe(1);
	});

	it('a product state the field pairing put above 1/8 stays ≤ 1/8 with the cyclic pairing', () => {
		// |a⟩|a*⟩ with a = (ω⁷|0⟩ + ω⁶|1⟩ + ω|3⟩ + ω⁴|6⟩)/2, ω = e^{2πi/8}: separable, so F ≤ 1/8
		// (Terhal & Horodecki, Phys. Rev. A 61, 040301(R) (2000)).
		const d = 8;
		const phases: Record<number, number> = { 0: 7, 1: 6, 3: 1, 6: 4 };
		const amp = (conj: boolean) =>
			math.matrix(
				Array.from({ length: d }, (_, m) => {
					if (!(m in phases)) return [0];
					const angle = ((conj ? -2 : 2) * Math.PI * phases[m]) / 8;
					return [math.complex(Math.cos(angle) / 2, Math.sin(angle) / 2)];
				})
			);
		const rho = projector(math.kron(amp(false), amp(true)) as math.Matrix);
		const p = exactTables(rho, d, 'cyclic');
		expect(expectation(rho, maximallyEntangled(d))).toBeLessThanOrEqual(1 / 8 + 1e-12);
		expect(family.statistic(p, d, [0, 1], 'cyclic')).toBeLessThanOrEqual(1 / 8 + 1e-12);
		expect(family.statistic(p, d, [0, 1], 'field')).toBeGreaterThan(0.13);
	});
});

describe('the convention in certify() and in JSON counts files', () => {
	const d9 = expectedCounts(states.isotropic(9, 0.9), [0, 1, 2], 1e6, 'field');

	it('mub-correlation with basis 2 in d = 9 needs fourier=field', () => {
		expect(() => certify(d9, { method: 'mub-correlation', bases: [0, 1, 2] })).toThrow(
			/basis 2 in d = 9 exists only with fourier=field/
		);
		const ok = certify(d9, {
			method: 'mub-correlation',
			bases: [0, 1, 2],
			fourier: 'field',
			resamples: 200
		});
		expect(ok.fourier).toBe('field');
	});

	it('d = 4: the cyclic transform cannot be combined with bases 2, 3, 4 (issue 6 §5)', () => {
		const all = expectedCounts(states.spectrum(4, [1]), [0, 1, 2, 3, 4], 1e6, 'field');
		expect(() => certify(all, { method: 'mub-correlation' })).toThrow(
			/bases: basis 2 in d = 4 exists only with fourier=field/
		);
	});

	it('fourier=field in d = 6 is refused', () => {
		const d6 = expectedCounts(states.isotropic(6, 0.9), [0, 1], 1e6);
		expect(() => certify(d6, { method: 'fidelity-two-basis', fourier: 'field' })).toThrow(
			InputError
		);
		expect(() => certify(d6, { method: 'fidelity-two-basis', fourier: 'field' })).toThrow(
			/prime-power dimension/
		);
	});

	it('a JSON file may declare the convention; a different one is refused naming $.fourier', () => {
		const p = exactTables(stateNearPhi(4, 3, 0.9), 4, 'field');
		const text = countsJson(p, 4, 1e6, 'field');
		const data = parseCounts(text, 4);
		expect(data.declaredFourier).toMatchObject({ convention: 'field', line: 1 });
		expect(certify(data, { method: 'fidelity-two-basis', resamples: 200 }).fourier).toBe('field');
		expect(() => certify(data, { method: 'fidelity-two-basis', fourier: 'cyclic' })).toThrow(
			/\$\.fourier: the file declares "field" but the check says "cyclic"/
		);
	});

	it('for prime d a declared convention never conflicts, and field says the two coincide', () => {
		const p = exactTables(stateNearPhi(5, 3, 0.9), 5, 'cyclic');
		const data = parseCounts(countsJson(p, 5, 1e6, 'field'), 5);
		const result = certify(data, {
			method: 'fidelity-two-basis',
			fourier: 'cyclic',
			resamples: 200
		});
		expect(result.fourier).toBe('cyclic');
		const field = certify(data, { method: 'fidelity-two-basis', resamples: 200 });
		expect(field.fourier).toBe('field');
		expect(field.statistic.value).toBe(result.statistic.value);
		expect(field.warnings.join(' ')).toMatch(/same bases/);
	});

	it('a bad "fourier" value or field in d = 6 is an error naming $.fourier and its line', () => {
		const bad = '{\n"dimension": 4,\n"fourier": "dft",\n"tables": []}';
		expect(() => parseCounts(bad, 4)).toThrow(
			/line 3, column 12: \$\.fourier: expected "cyclic" or "field"/
		);
		const six = '{"dimension": 6, "fourier": "field", "tables": []}';
		expect(() => parseCounts(six, 6)).toThrow(/\$\.fourier: fourier=field needs a prime-power/);
	});
});
