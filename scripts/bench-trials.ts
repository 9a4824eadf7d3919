/**
 * Bench row of issue 20: 10⁷ time-ordered trials (d = 31, visibility 0.9, two bases) through the
 * whole check as the command line runs it, i.i.d. comparison included. Measured, not asserted.
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { isotropicTrialsCsv } from '../src/lib/certify/trials';

export const TRIALS_BENCH = { d: 31, visibility: 0.9, trials: 10_000_000 };

/** Writes the file into `folder` and returns the command line's arguments for it. */
export function trialsBenchArgs(folder: string): string[] {
	const { d, visibility, trials } = TRIALS_BENCH;
	const file = path.join(folder, 'trials.csv');
	writeFileSync(file, isotropicTrialsCsv(d, visibility, [0, 1], trials, 11));
	return [
		'scripts/cli.mjs',
		'certify',
		...['--trials', file, '--dimension', String(d), '--method', 'mub-correlation', '--json']
	];
}
