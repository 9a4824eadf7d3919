/**
 * Bench row of issue 20: 10⁷ time-ordered trials (d = 31, visibility 0.9, two bases) through the
 * whole check as the command line runs it, i.i.d. comparison included. Measured, not asserted.
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { isotropicTrialsCsv } from '../src/lib/certify/trials';

export const TRIALS_BENCH = { d: 31, visibility: 0.9, trials: 10_000_000 };
/** The target: the whole check of 10⁷ trials within this many seconds (wall time). */
export const TRIALS_TARGET_S = 10;

/** The bench row's words: the measured wall time as a share of the target, and whether it is met. */
export function trialsTargetCells(wall: number): { ratio: string; target: string; met: string } {
	return {
		ratio: `${(wall / TRIALS_TARGET_S).toFixed(2)} of target`,
		target: `≤ ${TRIALS_TARGET_S} s`,
		met: wall <= TRIALS_TARGET_S ? 'yes' : 'NO'
	};
}

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
