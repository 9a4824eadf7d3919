/**
 * The rules of analyses (src/lib/evidence/analyses.ts): the Bonferroni level (Bonferroni's
 * inequality, P(∪ Aᵢ) ≤ Σ P(Aᵢ); Dunn, J. Am. Stat. Assoc. 56, 52 (1961), reference from memory), the derived seed and
 * what makes two analyses distinct.
 */
import { describe, expect, it } from 'vitest';
import {
	analysesProblem,
	analysisKey,
	correctedConfidence,
	derivedSeed,
	seedChoice,
	type AnalysisSettings
} from '../../src/lib/evidence/analyses';

const settings: AnalysisSettings = {
	method: 'mub-correlation',
	bases: [0, 1, 2],
	fourier: 'cyclic',
	confidence: 0.9,
	resamples: 1000,
	subtractAccidentals: false
};
const counts = 'ab'.repeat(32);

describe('the stated level', () => {
	it('keeps the declared analysis alone at its confidence and spends α/n otherwise', () => {
		expect(correctedConfidence({ total: 1, declared: true, nominalConfidence: 0.9 })).toBe(0.9);
		// The declared analysis after others were tried is corrected too (issue 15, literally).
		expect(correctedConfidence({ total: 31, declared: true, nominalConfidence: 0.9 })).toBeCloseTo(
			1 - 0.1 / 31,
			15
		);
		expect(correctedConfidence({ total: 1, declared: false, nominalConfidence: 0.99 })).toBeCloseTo(
			0.99,
			15
		);
		expect(correctedConfidence({ total: 4, declared: false, nominalConfidence: 0.99 })).toBe(
			1 - 0.01 / 4
		);
	});

	it('finds a manifest whose stated confidence or count does not hold together', () => {
		const entry = { ...settings, seed: 'derived' as const, firstRunAt: '2026-01-01T00:00:00Z' };
		const a = { total: 2, declared: true, nominalConfidence: 0.9, list: [entry, entry] };
		expect(analysesProblem(a, 1 - 0.1 / 2)).toBeNull();
		expect(analysesProblem(a, 0.9)).toMatch(/not the corrected level/);
		expect(analysesProblem({ ...a, total: 3 }, 1 - 0.1 / 3)).toMatch(/lists 2 analyses but says 3/);
		expect(analysesProblem({ ...a, total: 0, list: [] }, 0.9)).toMatch(/≥ 1/);
	});
});

describe('the derived seed and distinct analyses', () => {
	it('is a whole number in the engine’s range, the same for the same counts and settings', () => {
		const seed = derivedSeed(counts, settings);
		expect(Number.isInteger(seed) && seed >= 1 && seed <= 4294967295).toBe(true);
		expect(derivedSeed(counts, { ...settings })).toBe(seed);
		expect(derivedSeed('cd'.repeat(32), settings)).not.toBe(seed);
		expect(derivedSeed(counts, { ...settings, confidence: 0.95 })).not.toBe(seed);
		expect(derivedSeed(counts, { ...settings, bases: [0, 1] })).not.toBe(seed);
	});

	it('treats a chosen seed equal to the derived one as the same analysis, any other as new', () => {
		const seed = derivedSeed(counts, settings);
		expect(seedChoice(counts, settings, seed)).toBe('derived');
		expect(seedChoice(counts, settings, seed === 7 ? 8 : 7)).not.toBe('derived');
		expect(analysisKey(settings, 'derived')).toBe(analysisKey({ ...settings }, 'derived'));
		expect(analysisKey(settings, 'derived')).not.toBe(analysisKey(settings, 7));
		// Order matters to fidelity-two-basis (its first basis is read differently): kept as given.
		expect(analysisKey({ ...settings, bases: [1, 0] }, 'derived')).not.toBe(
			analysisKey({ ...settings, bases: [0, 1] }, 'derived')
		);
	});
});
