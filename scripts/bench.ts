/**
 * npm run bench: time of each method's confidence draws (Beta draws on the per-basis totals,
 * docs/statistics.md; for the fidelity method they bound the floor, and certify adds the exact
 * cell limits) against a naive per-cell Poisson bootstrap of the method's plug-in statistic with
 * the same generator, as engine 1.0.0 did (not a valid bound for the fidelity method; a speed
 * reference only), in one run. Data: simulated isotropic states, visibility 0.9, 10^6 pairs per basis.
 */
import { performance } from 'node:perf_hooks';
import { bootstrapReplicates } from '../src/lib/certify/bootstrap';
import { perCellModel } from '../src/lib/certify/cell-model';
import { drawReplicates, sufficientDraws } from '../src/lib/certify/confidence';
import {
	certify,
	expectedCounts,
	states,
	witnessFamilies,
	type MethodId
} from '../src/lib/certify';

const RESAMPLES = 10_000;
const NAIVE_BUDGET_CELLS = 2e7; // per-cell draws allowed for one naive run before it is scaled down
const dimensions = [8, 31, 64, 127];
const methods: { id: MethodId; bases: number[] }[] = [
	{ id: 'mub-correlation', bases: [0, 1, 2] },
	{ id: 'steering-2mub', bases: [0, 1] },
	{ id: 'fidelity-two-basis', bases: [0, 1] }
];

function seconds(run: () => void): number {
	const start = performance.now();
	run();
	return (performance.now() - start) / 1000;
}

const rows: string[][] = [];
for (const d of dimensions) {
	// Every benchmark dimension is a prime power; field keeps basis 2 available in d = 8 and 64.
	const data = expectedCounts(states.isotropic(d, 0.9), [0, 1, 2], 1e6, 'field');
	let together = 0;
	for (const { id, bases } of methods) {
		const family = witnessFamilies[id];
		const full = seconds(() =>
			certify(data, { method: id, bases, fourier: 'field', resamples: RESAMPLES, seed: 1 })
		);
		together += full;
		const tables = bases.map((t) => data.tables.find((x) => x.basis === t)!);
		const fast = sufficientDraws(tables, d);
		const naive = perCellModel(tables, d, (p) => family.statistic(p, d, bases, 'field'), {
			subtractAccidentals: false
		});
		const tFast = seconds(() => drawReplicates(fast, { resamples: RESAMPLES, seed: 1 }));
		const naiveResamples = Math.min(
			RESAMPLES,
			Math.max(200, Math.floor(NAIVE_BUDGET_CELLS / naive.means.length / 10) * 10)
		);
		const tNaive =
			(seconds(() => bootstrapReplicates(naive, { resamples: naiveResamples, seed: 1 })) *
				RESAMPLES) /
			naiveResamples;
		rows.push([
			String(d),
			id,
			`${4 * bases.length} gamma`,
			String(naive.means.length),
			full.toFixed(3),
			tFast.toFixed(3),
			`${tNaive.toFixed(2)}${naiveResamples < RESAMPLES ? ` (from ${naiveResamples})` : ''}`,
			`${(tNaive / tFast).toFixed(0)}×`
		]);
	}
	rows.push([String(d), 'all three (certify)', '', '', together.toFixed(3), '', '', '']);
}

const head = [
	'd',
	'method',
	'draws/resample',
	'naive Poisson draws',
	'certify s',
	'draws s',
	'naive bootstrap s',
	'speed-up'
];
const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
const line = (r: string[]) => r.map((c, i) => c.padEnd(widths[i])).join('  ');
console.log(
	`Rankseal bench: ${RESAMPLES} resamples, node ${process.version}, one run (naive times scaled per resample where marked)`
);
console.log(line(head));
console.log(widths.map((w) => '-'.repeat(w)).join('  '));
for (const r of rows) console.log(line(r));
