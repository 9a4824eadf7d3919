/**
 * Coverage rows for calibrated bases (docs/statistics.md §8): the product state of issue 22's
 * d = 3 example, measured in bases within 2 % of unbiased (tests/fixtures/calibrated-d3-bases.json),
 * certified with that calibration. Its S = 1.6804 exceeds §4.1's separable bound; a false
 * certificate here means the calibrated ladder failed.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { parseCalibration } from '../src/lib/certify/calibration';
import { calibratedProductState } from '../src/lib/certify/calibration/product-state';
import type { CoverageCase } from './coverage-run';

/** ψ of the example's product state |ψ⟩|ψ*⟩ (the construction in docs/statistics.md §8). */
export const EXAMPLE_PSI: [number, number][] = [
	[0.9097344743161914, 0],
	[-0.08338962816027987, 0.21399618857109173],
	[-0.21951700402501928, 0.26729622589340507]
];

export function calibratedCases(root = process.cwd()): CoverageCase[] {
	const file = path.join(root, 'tests/fixtures/calibrated-d3-bases.json');
	const calibration = parseCalibration(readFileSync(file), 3);
	const state = calibratedProductState(
		'product, bases 2 % off, calibrated, d=3',
		calibration,
		EXAMPLE_PSI
	);
	return [{ method: 'mub-correlation', bases: [0, 1, 2], state, calibration }];
}
