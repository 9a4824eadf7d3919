/**
 * Bench rows for pixel-scale dimensions (issue 19, part 4): d = 512 and 1 024, whole process of
 * the command line for each method on two bases, from the JSON form (a CSV of 10⁶ rows a basis
 * would pass the file limit). Resamples: the cells × resamples ceiling of each size (limits.ts),
 * said on the row. Each row is also stated as a multiple of Node's own start. numpy is not run here.
 */
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { resamplesCeiling } from '../src/lib/certify';
import { isotropicCounts, toCountsJson } from '../src/lib/certify/planner/white-counts';

export const LARGE_DIMENSIONS = [512, 1024];
const METHODS = ['mub-correlation', 'steering-2mub', 'fidelity-two-basis'];

export interface LargeRow {
	d: number;
	what: string;
	wall: number;
}

function wallOf(args: string[]): number {
	const start = performance.now();
	const run = spawnSync(process.execPath, args, { encoding: 'utf8', maxBuffer: 1 << 26 });
	if (run.status !== 0) throw new Error(`${args.join(' ')} failed: ${run.stderr}`);
	return (performance.now() - start) / 1000;
}

const median = (xs: number[]) => xs.sort((a, b) => a - b)[(xs.length - 1) >> 1];

/** Median wall seconds of `runs` whole-process checks per method and size. */
export function largeRows(folder: string, runs: number): LargeRow[] {
	const rows: LargeRow[] = [];
	for (const d of LARGE_DIMENSIONS) {
		const file = path.join(folder, `d${d}.json`);
		writeFileSync(file, toCountsJson(isotropicCounts(d, 0.9, [0, 1], 1e6, 7)));
		const resamples = resamplesCeiling(d, 2);
		for (const method of METHODS) {
			const args = ['scripts/cli.mjs', 'certify', '--counts', file, '--dimension', String(d)];
			args.push('--method', method, '--bases', '0,1', '--resamples', String(resamples), '--json');
			const wall = median(Array.from({ length: runs }, () => wallOf(args)));
			rows.push({ d, what: `${method} (${resamples} resamples: the size's ceiling)`, wall });
		}
	}
	return rows;
}
