/**
 * npm run coverage: the measured coverage of every method's lower bound (docs/statistics.md).
 * For each boundary state, isotropic state and mixture, at 20, 100, 1000 and 20 000 counts per
 * basis and at confidence 0.9 and 0.99865: the miss rate (lower bound above the witness's true
 * value), the false-certification rate (certified above the true Schmidt number), each with its
 * binomial standard error at the nominal rate, and the mean certified Schmidt number. For the
 * fidelity method a second table compares it with `mub-correlation` on the same data sets.
 * Not a test: it prints a Markdown table. `--scale 0.1` runs a tenth of the experiments;
 * `--cases 7-9` only those cases; `--target 0-4` only those fidelity-target rows (scripts/
 * coverage-target.ts; `--target none` skips them), so that new rows run without the whole table.
 */
import { parseArgs } from 'node:util';
import { states, type MethodId } from '../src/lib/certify';
import {
	crossTalk,
	localHiddenStateAtBeta1,
	separableFourierCorrelated,
	simulatedState,
	type TableState
} from '../src/lib/certify/simulate-tables';
import { calibratedCases } from './coverage-calibrated';
import { missAllowance, runCoverage, type CoverageCase } from './coverage-run';
import { targetRows } from './coverage-target-rows';

const { values } = parseArgs({
	options: {
		scale: { type: 'string', default: '1' },
		cases: { type: 'string' },
		target: { type: 'string' }
	}
});
const scale = Number(values.scale);
// `--cases 7-9` runs only those rows of coverageCases (0-based), e.g. to split a run over processes.
const [firstCase, lastCase] = (values.cases ?? '0-99').split('-').map(Number);

const phi = (d: number, r: number) => simulatedState(`Φ${r}, d=${d}`, states.rankLimited(d, r));
const isotropic = (d: number, eta: number) =>
	simulatedState(`isotropic η=${eta}, d=${d}`, states.isotropic(d, eta));
const mixture = (d: number, r: number, eta: number) =>
	simulatedState(`${eta}·Φ${r} + white, d=${d}`, states.rankLimited(d, r, eta));

const at = (method: MethodId, state: TableState, bases = [0, 1]): CoverageCase => ({
	method,
	bases,
	state
});

export const coverageCases: CoverageCase[] = [
	at('mub-correlation', phi(7, 3)),
	at('mub-correlation', phi(7, 3), [0, 1, 2, 3]),
	at('mub-correlation', phi(8, 7)),
	at('mub-correlation', separableFourierCorrelated(13)),
	at('mub-correlation', isotropic(11, 0.8)),
	at('mub-correlation', mixture(8, 4, 0.9)),
	at('steering-2mub', localHiddenStateAtBeta1(7, [0, 1])),
	at('steering-2mub', isotropic(11, 0.8)),
	at('steering-2mub', mixture(8, 4, 0.9)),
	at('fidelity-two-basis', separableFourierCorrelated(13)),
	at('fidelity-two-basis', phi(7, 3)),
	at('fidelity-two-basis', isotropic(11, 0.8)),
	at('fidelity-two-basis', mixture(8, 4, 0.9)),
	// Engine 3.0.0: a boundary state in every basis (P_0 = 1, the others 3/7; Poisson totals).
	at('mub-correlation', phi(7, 3), [0, 1, 2, 3, 4, 5, 6, 7]),
	...calibratedCases(),
	// Engine 3.1.0: the fidelity split (floor and cell limits share α) where the cell limits win
	// (docs/statistics.md §14): F = v exactly; at v = 6/7 in d = 7 the state sits on the r = 6 rung.
	at('fidelity-two-basis', crossTalk(7, 6 / 7)),
	at('fidelity-two-basis', crossTalk(4, 0.85))
];

const settings = [
	{ confidence: 0.9, experiments: 1000, resamples: 1000 },
	{ confidence: 0.99865, experiments: 2000, resamples: 4000 }
];
const countLevels = [20, 100, 1000, 20_000];

const pct = (x: number) => (100 * x).toFixed(2);
const started = Date.now();
console.log(
	`Rankseal coverage, engine as built; experiments ×${scale}; resamples 1000 at 0.9, 4000 at 0.99865`
);
console.log(
	'| method | state (true SN) | bases | counts/basis | confidence | N | miss % (± SE at nominal) | miss of F % | false cert. % | mean certified | flag |'
);
console.log('|---|---|---|---|---|---|---|---|---|---|---|');
let flagged = 0;
const pairedRows: string[] = [];
for (const c of coverageCases.slice(firstCase, lastCase + 1)) {
	for (const n of countLevels) {
		for (const s of settings) {
			const experiments = Math.max(10, Math.round(s.experiments * scale));
			const o = runCoverage(c, { ...s, experiments, countsPerBasis: n, firstSeed: 1 });
			const q = 1 - s.confidence;
			const judged = experiments - o.refused;
			const se = Math.sqrt((q * (1 - q)) / judged);
			const over = [o.misses, o.falseCertificates, o.missesOfFidelity ?? 0].some(
				(k) => k > missAllowance(q, judged)
			);
			if (over) flagged++;
			const sn = `${c.state.schmidtNumberIsBound ? '≤' : ''}${c.state.schmidtNumber}`;
			console.log(
				`| ${c.method} | ${c.state.label} (${sn}) | ${c.bases.join(',')} | ${n} | ${s.confidence} | ${judged}${o.refused ? ` (+${o.refused} refused)` : ''} | ` +
					`${pct(o.misses / judged)} ± ${pct(se)} | ${o.missesOfFidelity === null ? '–' : pct(o.missesOfFidelity / judged)} | ` +
					`${pct(o.falseCertificates / judged)} | ${o.meanCertified.toFixed(3)} | ${over ? 'OVER' : ''} |`
			);
			if (o.paired)
				pairedRows.push(
					`| ${c.state.label} | ${n} | ${s.confidence} | ${judged} | ${o.meanCertified.toFixed(3)} | ` +
						`${o.paired.meanCertified.toFixed(3)} | ${o.paired.fewer} | ${o.paired.more} |`
				);
		}
	}
}
flagged += targetRows(values.target ?? '0-99', scale, settings, countLevels);
if (pairedRows.length > 0) {
	// Issue 19: the fidelity method against the two-basis sum on the very same data sets.
	console.log(
		'\n| state | counts/basis | confidence | N | fidelity mean certified | mub-correlation (0,1) mean certified | fidelity fewer | fidelity more |'
	);
	console.log('|---|---|---|---|---|---|---|---|');
	for (const row of pairedRows) console.log(row);
}
console.log(
	`\n${flagged} settings above nominal + 3 SE + 1; ${((Date.now() - started) / 1000).toFixed(0)} s`
);
