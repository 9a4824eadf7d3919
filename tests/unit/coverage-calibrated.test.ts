/**
 * The coverage benchmark's calibrated row (scripts/coverage-calibrated.ts), in small: the product
 * state of issue 22's d = 3 example at 10⁶ counts per basis. With the plain ladder of §4.1 most
 * experiments certify Schmidt number ≥ 2 (false); with the calibration none may, beyond the level.
 */
import { describe, expect, it } from 'vitest';
import { calibratedCases } from '../../scripts/coverage-calibrated';
import { missAllowance, runCoverage } from '../../scripts/coverage-run';

const settings = {
	countsPerBasis: 1_000_000,
	confidence: 0.99865,
	experiments: 40,
	resamples: 1000,
	firstSeed: 1
};

describe('coverage with calibrated bases', () => {
	const [calibrated] = calibratedCases();

	it('the state’s exact S is the example’s 1.6804, above §4.1’s separable bound', () => {
		const outcome = runCoverage(calibrated, { ...settings, experiments: 1 });
		expect(outcome.truth).toBeCloseTo(1.6804, 9);
		expect(outcome.truth).toBeGreaterThan(1 + 2 / 3);
	});

	it('without the calibration the plain ladder certifies the product state falsely', () => {
		const plain = runCoverage({ ...calibrated, calibration: undefined }, settings);
		expect(plain.falseCertificates).toBeGreaterThan(settings.experiments / 2);
	});

	it('with it: no false certificates beyond the level, and the bound still covers S', () => {
		const o = runCoverage(calibrated, settings);
		expect(o.falseCertificates).toBeLessThanOrEqual(missAllowance(1 - settings.confidence, 40));
		expect(o.misses).toBeLessThanOrEqual(missAllowance(1 - settings.confidence, 40));
		expect(o.refused).toBe(0);
	});
});
