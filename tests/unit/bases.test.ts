import { describe, expect, it } from 'vitest';
import { availableBases, basisVectors, largestOverlapError } from '../../src/lib/certify/bases';
import { primePower } from '../../src/lib/certify/finite-field';

describe('mutually unbiased bases (witnesses.md §2, §8)', () => {
	// Complete sets of d + 1 MUBs for prime powers (fourier=field): Wootters & Fields, Ann. Phys.
	// 191, 363 (1989); Galois-ring case for d = 2^s: Klappenecker & Rötteler, LNCS 2948 (2004)
	// (from memory). |⟨i_s|j_t⟩|² = 1/d across bases and δ_ij within a basis, to 1e-12.
	for (const d of [2, 3, 4, 5, 7, 8, 9, 16, 25, 27, 31, 32]) {
		it(`d = ${d}: d + 1 field bases, all pairs unbiased, each orthonormal`, () => {
			expect(availableBases(d, 'field')).toHaveLength(d + 1);
			expect(largestOverlapError(d, availableBases(d, 'field'), 'field')).toBeLessThan(1e-12);
		});
	}

	it('dimensions that are not prime powers have the computational and Fourier bases only', () => {
		for (const d of [6, 10, 12, 15]) {
			expect(primePower(d)).toBeNull();
			expect(availableBases(d)).toEqual([0, 1]);
			expect(largestOverlapError(d, [0, 1])).toBeLessThan(1e-12);
		}
	});

	it('basis 1 is the cyclic Fourier basis d^{-1/2} Σ ω^{jm}|m⟩ for prime and non-prime-power d', () => {
		for (const d of [5, 6, 7]) {
			const { re, im } = basisVectors(d, 1);
			for (let j = 0; j < d; j++) {
				for (let m = 0; m < d; m++) {
					const angle = (2 * Math.PI * j * m) / d;
					expect(re[j * d + m]).toBeCloseTo(Math.cos(angle) / Math.sqrt(d), 12);
					expect(im[j * d + m]).toBeCloseTo(Math.sin(angle) / Math.sqrt(d), 12);
				}
			}
		}
	});

	it('odd prime d: basis t is d^{-1/2} Σ ω^{(t−1)m² + jm}|m⟩ (Wootters & Fields 1989)', () => {
		const d = 7;
		for (const t of [2, 4, 7]) {
			const { re, im } = basisVectors(d, t);
			for (let j = 0; j < d; j++) {
				for (let m = 0; m < d; m++) {
					const angle = (2 * Math.PI * ((t - 1) * m * m + j * m)) / d;
					expect(re[j * d + m]).toBeCloseTo(Math.cos(angle) / Math.sqrt(d), 12);
					expect(im[j * d + m]).toBeCloseTo(Math.sin(angle) / Math.sqrt(d), 12);
				}
			}
		}
	});

	it('d = 2: basis 2 is (|0⟩ ± i|1⟩)/√2 (witnesses.md §2)', () => {
		const { re, im } = basisVectors(2, 2);
		const h = 1 / Math.SQRT2;
		expect([...re]).toEqual([h, expect.closeTo(0, 15), h, expect.closeTo(0, 15)]);
		expect([im[1], im[3]].sort()).toEqual([-h, h].map((x) => expect.closeTo(x, 15)).sort());
	});

	it('rejects a basis index that does not exist', () => {
		expect(() => basisVectors(6, 2)).toThrow(/does not exist/);
		expect(() => basisVectors(5, 6)).toThrow(/does not exist/);
	});
});
