/**
 * One cell of the coverage benchmark (docs/statistics.md), shared by `npm run coverage` and
 * tests/unit/coverage.test.ts: repeated experiments drawn from a state's exact tables, each
 * certified with the engine; counts of misses (lower bound above the witness's true value)
 * and false certificates (certified above the true Schmidt number).
 */
import { certify, InputError, witnessFamilies, type MethodId } from '../src/lib/certify';
import type { Calibration } from '../src/lib/certify/calibration';
import { sampleTables, type TableState } from '../src/lib/certify/simulate-tables';

export interface CoverageCase {
	method: MethodId;
	bases: number[];
	state: TableState;
	/** Measured bases the ladder uses (witnesses.md §4.4); the state's tables are in these bases. */
	calibration?: Calibration;
}

export interface CoverageSettings {
	countsPerBasis: number;
	confidence: number;
	experiments: number;
	resamples: number;
	/** Experiment e uses data seed firstSeed + e and bootstrap seed firstSeed + e + 1e6. */
	firstSeed: number;
}

export interface CoverageOutcome {
	experiments: number;
	misses: number;
	/** Fidelity only: lower bound above F itself. */
	missesOfFidelity: number | null;
	falseCertificates: number;
	refused: number;
	meanCertified: number;
	truth: number;
	/**
	 * Fidelity only: `mub-correlation` on bases 0 and 1 run on the same data at the same
	 * confidence (issue 19): how often the fidelity method certified fewer or more rungs, and the
	 * sum's mean certified Schmidt number.
	 */
	paired: { fewer: number; more: number; meanCertified: number } | null;
}

export function trueWitnessValue(c: CoverageCase): number {
	const d = c.state.dimension;
	const tables = c.bases.map((t) => c.state.table(t));
	return witnessFamilies[c.method].statistic(tables, d, c.bases);
}

export function runCoverage(c: CoverageCase, s: CoverageSettings): CoverageOutcome {
	const truth = trueWitnessValue(c);
	const fidelity = c.method === 'fidelity-two-basis' ? c.state.fidelity : null;
	const out = { misses: 0, missesOfFidelity: 0, falseCertificates: 0, refused: 0, certified: 0 };
	const paired = { fewer: 0, more: 0, certified: 0 };
	for (let e = 0; e < s.experiments; e++) {
		const data = sampleTables(c.state, c.bases, s.countsPerBasis, s.firstSeed + e);
		try {
			const r = certify(data, {
				method: c.method,
				bases: c.bases,
				confidence: s.confidence,
				resamples: s.resamples,
				seed: s.firstSeed + e + 1_000_000,
				calibration: c.calibration
			});
			if (r.statistic.lower > truth) out.misses++;
			if (fidelity !== null && r.statistic.lower > fidelity) out.missesOfFidelity++;
			if (r.certifiedSchmidtNumber > c.state.schmidtNumber) out.falseCertificates++;
			out.certified += r.certifiedSchmidtNumber;
			if (fidelity !== null) {
				const sum = certify(data, {
					method: 'mub-correlation',
					bases: [0, 1],
					confidence: s.confidence,
					resamples: s.resamples,
					seed: s.firstSeed + e + 1_000_000,
					calibration: c.calibration
				}).certifiedSchmidtNumber;
				paired.certified += sum;
				if (r.certifiedSchmidtNumber < sum) paired.fewer++;
				if (r.certifiedSchmidtNumber > sum) paired.more++;
			}
		} catch (error) {
			if (!(error instanceof InputError)) throw error;
			out.refused++;
		}
	}
	const judged = s.experiments - out.refused;
	return {
		experiments: s.experiments,
		misses: out.misses,
		missesOfFidelity: fidelity === null ? null : out.missesOfFidelity,
		falseCertificates: out.falseCertificates,
		refused: out.refused,
		meanCertified: judged > 0 ? out.certified / judged : NaN,
		truth,
		paired:
			fidelity === null
				? null
				: { fewer: paired.fewer, more: paired.more, meanCertified: paired.certified / judged }
	};
}

/** The most misses consistent with a rate at most `nominal`: nominal·N + 3·√(N·p(1 − p)) + 1. */
export function missAllowance(nominal: number, n: number): number {
	return nominal * n + 3 * Math.sqrt(n * nominal * (1 - nominal)) + 1;
}
