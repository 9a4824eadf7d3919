/**
 * npm run bench: whole-process time of the command line (`node scripts/cli.mjs certify`, what
 * `npm run certify` runs: the launcher and its prebuilt bundle) beside the script a physicist
 * would write (scripts/bench-numpy.py: numpy's per-cell Poisson bootstrap of the plug-in
 * statistic, a percentile), 10 000 resamples, in one run, row by row so that both see the same
 * load, with Node's own start (`node -e 0`) as the floor of any command line; then the
 * end-to-end time to issue a certificate. Data: simulated isotropic states, visibility 0.9,
 * 10⁶ pairs per basis. Each time is the median of several runs (ours: 7; numpy: 5 at d = 31,
 * 1 at d = 127, where one run takes half a minute), since one start of a process can meet a
 * busy moment. Wall time is what the targets are about; CPU time (the children's user + system,
 * from /proc) is printed beside it because it moves less on a shared machine. Not a test:
 * nothing here asserts a duration.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { ENGINE_VERSION, sampledCounts, states, toCountsCsv } from '../src/lib/certify';
import { issueTimes } from './bench-issue';
import { LARGE_DIMENSIONS, largeRows } from './bench-large';
import { trialsRow } from './bench-trials';
import { adviceRows } from './bench-advice';

const RESAMPLES = 10_000;
/** Runs per median: ours, and numpy by dimension (its d = 127 runs take about 30 s each). */
const OUR_RUNS = 7;
const NUMPY_RUNS: Record<number, number> = { 31: 5, 127: 1 };
const DIMENSIONS = [31, 127];
const METHODS = ['mub-correlation', 'steering-2mub', 'fidelity-two-basis'];
/** The issue's targets (ours at least this many times faster than numpy, whole process). */
const TARGETS: Record<string, number> = {
	'31 mub-correlation': 10,
	'31 steering-2mub': 10,
	'31 fidelity-two-basis': 10,
	'127 fidelity-two-basis': 20
};

/** CPU seconds of waited-for children (Linux /proc: cutime + cstime in clock ticks of 1/100 s). */
function childrenCpu(): number | null {
	try {
		const fields = readFileSync('/proc/self/stat', 'utf8').split(') ')[1].split(' ');
		return (Number(fields[13]) + Number(fields[14])) / 100;
	} catch {
		return null;
	}
}

interface Timing {
	wall: number;
	cpu: number | null;
}

function timed(command: string, args: string[]): Timing {
	const cpu = childrenCpu();
	const start = performance.now();
	const run = spawnSync(command, args, { encoding: 'utf8', maxBuffer: 1 << 26 });
	const wall = (performance.now() - start) / 1000;
	if (run.status !== 0) throw new Error(`${command} ${args.join(' ')} failed: ${run.stderr}`);
	const after = childrenCpu();
	return { wall, cpu: cpu === null || after === null ? null : after - cpu };
}

/** The median wall and CPU times of `runs` runs. */
function medianOf(runs: number, run: () => Timing): Timing {
	const times = Array.from({ length: runs }, run);
	const median = (xs: number[]) => xs.sort((a, b) => a - b)[(xs.length - 1) >> 1];
	const cpus = times.map((t) => t.cpu);
	return {
		wall: median(times.map((t) => t.wall)),
		cpu: cpus.includes(null) ? null : median(cpus as number[])
	};
}

function printTable(rows: string[][]) {
	const head = [
		'd',
		'what',
		'ours s',
		'ours CPU s',
		'numpy s',
		'numpy CPU s',
		'ratio',
		'CPU ratio'
	];
	head.push('target', 'met');
	const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
	const line = (r: string[]) => r.map((c, i) => c.padEnd(widths[i])).join('  ');
	console.log(line(head));
	console.log(widths.map((w) => '-'.repeat(w)).join('  '));
	for (const r of rows) console.log(line(r));
}

/** The trials row's time: the median of 3 whole-process runs (each takes seconds). */
const trialsTimes = (args: string[]) => medianOf(3, () => timed(process.execPath, args));
const blank = (n: number) => new Array<string>(n).fill('');
const f = (x: number | null, digits = 2) => (x === null ? '–' : x.toFixed(digits));
const only = process.argv.indexOf('--only');
if (only >= 0) {
	const what = process.argv[only + 1];
	if (what !== 'advice' && what !== 'trials') throw new Error('--only takes: advice, trials');
	const name = what === 'advice' ? 'counts-needed' : 'time-ordered trials';
	console.log(
		`Rankseal bench, engine ${ENGINE_VERSION}, node ${process.version}: ${name} rows only`
	);
	if (what === 'advice') printTable(adviceRows());
	else {
		const scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-bench-'));
		printTable([trialsRow(scratch, trialsTimes)]);
		rmSync(scratch, { recursive: true, force: true });
	}
	process.exit(0);
}

const numpy = spawnSync('python3', ['-c', 'import numpy; print(numpy.__version__)'], {
	encoding: 'utf8'
});
const numpyVersion = numpy.status === 0 ? numpy.stdout.trim() : null;
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-bench-'));
const files = new Map<number, string>();
for (const d of DIMENSIONS) {
	const file = path.join(folder, `d${d}.csv`);
	writeFileSync(file, toCountsCsv(sampledCounts(states.isotropic(d, 0.9), [0, 1, 2], 1e6, 7)));
	files.set(d, file);
}
const ours = (d: number, method: string) =>
	timed(process.execPath, [
		'scripts/cli.mjs',
		'certify',
		...['--counts', files.get(d)!, '--dimension', String(d), '--method', method],
		...['--bases', method === 'mub-correlation' ? '0,1,2' : '0,1', '--json']
	]);
ours(31, 'steering-2mub'); // builds the bundle if it is missing or stale; not timed

const rows: string[][] = [];
for (const d of DIMENSIONS) {
	for (const method of METHODS) {
		const us = medianOf(OUR_RUNS, () => ours(d, method));
		const them = numpyVersion
			? medianOf(NUMPY_RUNS[d], () =>
					timed('python3', [
						'scripts/bench-numpy.py',
						files.get(d)!,
						String(d),
						method,
						`${RESAMPLES}`
					])
				)
			: null;
		const ratio = them ? them.wall / us.wall : null;
		const target = TARGETS[`${d} ${method}`];
		rows.push([
			String(d),
			method,
			f(us.wall),
			f(us.cpu),
			f(them?.wall ?? null),
			f(them?.cpu ?? null),
			ratio === null ? '–' : `${ratio.toFixed(1)}×`,
			them && us.cpu && them.cpu ? `${(them.cpu / us.cpu).toFixed(1)}×` : '–',
			target ? `≥ ${target}×` : '',
			target && ratio !== null ? (ratio >= target ? 'yes' : 'NO') : ''
		]);
	}
}
const nodeAlone = medianOf(OUR_RUNS, () => timed(process.execPath, ['-e', '0']));
rows.push([
	'',
	'Node.js starting alone (node -e 0)',
	f(nodeAlone.wall),
	f(nodeAlone.cpu),
	...blank(6)
]);
for (const r of largeRows(folder, 3)) {
	const start = `${(r.wall / nodeAlone.wall).toFixed(1)}× Node's start`;
	rows.push([String(r.d), `${r.what}, ${start}`, f(r.wall), ...blank(7)]);
}
for (const t of await issueTimes([...DIMENSIONS, ...LARGE_DIMENSIONS], RESAMPLES)) {
	const total = t.check + t.issue;
	const versus = t.d > 256 ? `, ${(total / nodeAlone.wall).toFixed(1)}× Node's start` : '';
	const name = `issue a certificate (${t.method}, ${t.resamples} resamples): check ${f(t.check)} s + issue ${f(t.issue)} s${versus}`;
	rows.push([String(t.d), name, f(t.check + t.issue), ...blank(7)]);
}
rows.push(trialsRow(folder, trialsTimes));
rows.push(...adviceRows());
rmSync(folder, { recursive: true, force: true });

console.log(
	`Rankseal bench, engine ${ENGINE_VERSION}: ${RESAMPLES} resamples, node ${process.version}, ` +
		(numpyVersion
			? `numpy ${numpyVersion}; one run, medians of ${OUR_RUNS} (ours) and ` +
				`${Object.entries(NUMPY_RUNS)
					.map(([d, n]) => `${n} at d = ${d}`)
					.join(', ')} (numpy) runs`
			: 'numpy skipped: python3 with numpy not found')
);
printTable(rows);
