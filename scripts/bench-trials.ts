/**
 * Bench row of issue 20: 10⁷ time-ordered trials (d = 31, visibility 0.9, two bases) through the
 * whole check as the command line runs it, i.i.d. comparison included. Measured, not asserted.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { certify } from '../src/lib/certify';
import { witnessFamilies } from '../src/lib/certify/witnesses';
import {
	betAgainstEach,
	checkSettings,
	isotropicTrialsCsv,
	parseTrials,
	settingSequence
} from '../src/lib/certify/trials';
import { iidDataset, settingsPlan } from '../src/lib/certify/trials/settings-plan';

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

/**
 * The check's phases on the bench file, timed in this process one after another as certifyTrials
 * runs them (a shared machine moves the whole-process time; these show where it goes).
 */
export function trialsPhases(file: string): string {
	const times: string[] = [];
	let start = performance.now();
	const lap = (name: string) => {
		const now = performance.now();
		times.push(`${name} ${((now - start) / 1000).toFixed(2)} s`);
		start = now;
	};
	const bytes = readFileSync(file);
	createHash('sha256').update(bytes).digest('hex');
	lap('read + SHA-256');
	const data = parseTrials(bytes, TRIALS_BENCH.d, 'trials');
	lap('parse');
	const plan = settingsPlan(data, undefined, undefined);
	const bounds = witnessFamilies['mub-correlation'].bounds(data.dimension, plan.bases);
	const mus = bounds.map((b) => b / plan.bases.length);
	betAgainstEach(plan.codes, plan.values, mus, plan.xMax, 200);
	lap(`bets (${mus.length} rungs, one pass)`);
	checkSettings(settingSequence(data), plan.bases, plan.probabilities);
	lap('settings check');
	certify(iidDataset(data, plan.bases), { method: 'mub-correlation', bases: plan.bases });
	lap('i.i.d. comparison');
	return times.join(', ');
}

/** Issue 20's row: the whole command line on 10⁷ trials against 10 s, then its phases in-process. */
export function trialsRow(
	folder: string,
	time: (args: string[]) => { wall: number; cpu: number | null }
): string[] {
	const args = trialsBenchArgs(folder);
	const load = loadavg()[0];
	const { wall, cpu } = time(args);
	const target = trialsTargetCells(wall);
	const phases = trialsPhases(args[args.indexOf('--trials') + 1]);
	console.log(
		`time-ordered check phases (in-process, one run): ${phases}; load average ${load.toFixed(1)} before the row, ${loadavg()[0].toFixed(1)} after`
	);
	return [
		String(TRIALS_BENCH.d),
		`time-ordered check, ${TRIALS_BENCH.trials.toExponential(0)} trials (whole process; load average ${load.toFixed(1)} on ${availableParallelism()} cores)`,
		wall.toFixed(2),
		cpu === null ? '–' : cpu.toFixed(2),
		'',
		'',
		target.ratio,
		'',
		target.target,
		target.met
	];
}
