/**
 * Bench rows of issue 19: an unsupported claim that more counts would certify. `certify` (what
 * issuing a certificate and every offline verifier re-run) against the "counts needed" simulation
 * that engine 3.0.0 ran inside it and that now runs once after the check (planner/check-counts.ts).
 * In-process, median of several runs, same data and load for both. Measured, not asserted.
 */
import { performance } from 'node:perf_hooks';
import { certify, sampledCounts, states } from '../src/lib/certify';
import { countsAdvice } from '../src/lib/certify/planner/check-counts';

/** The data of tests/unit/verdict.test.ts's shape: isotropic η = 0.9, d = 5, 200 pairs a basis. */
const data = sampledCounts(states.isotropic(5, 0.9), [0, 1], 200, 11);
const options = { method: 'mub-correlation', bases: [0, 1], claim: 5, resamples: 10_000 };

function median(runs: number, run: () => void): number {
	const times = Array.from({ length: runs }, () => {
		const start = performance.now();
		run();
		return (performance.now() - start) / 1000;
	});
	return times.sort((a, b) => a - b)[(runs - 1) >> 1];
}

export interface AdviceTimes {
	/** certify alone: the certificate path (issuing, verify.mjs, npm run verify). */
	certify: number;
	/** The counts-needed simulation, once after the check. */
	advice: number;
}

export function adviceTimes(runs = 3): AdviceTimes {
	const result = certify(data, options);
	if (!result.claim?.moreCountsHelp) throw new Error('the bench data no longer need more counts');
	return {
		certify: median(runs * 5, () => certify(data, options)),
		advice: median(runs, () => countsAdvice(data, options, result))
	};
}

/** The bench table's rows (ten columns: d, what, seconds, then blanks). */
export function adviceRows(): string[][] {
	const t = adviceTimes();
	const s = (x: number) => x.toFixed(4);
	const row = (name: string, x: number) => [
		'5',
		`unsupported claim (mub-correlation, 10 000 resamples): ${name}`,
		s(x),
		...new Array<string>(7).fill('')
	];
	const ratio = (t.certify + t.advice) / t.certify;
	return [
		row('certify alone, what issuing and the verifiers re-run', t.certify),
		row('counts needed, simulated once after the check', t.advice),
		row(
			`both, what engine 3.0.0 re-ran on issuing: ${ratio.toFixed(0)}× certify alone`,
			t.certify + t.advice
		)
	];
}
