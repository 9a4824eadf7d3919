/**
 * A `fidelity-target` check from a counts file (witnesses.md §4.3′), for the command line: basis 0
 * is the full computational table, "basis" 1 the table measured in the tilted vectors ṽ_j (side B
 * ṽ_j*) at the same integration time, of which only the matching cells (j, j) are used. Raw counts
 * only: the normalisation is by the computational pair total, which needs equal times.
 */
import { InputError, requireCompleteTables, type CountsDataset } from '../counts';
import { ladderPosition } from '../ladder';
import { CONFIDENCE } from '../limits';
import { ENGINE_VERSION } from '../certify';
import { targetLowerBound, targetPointValue, targetUpperBound } from './bound';
import { targetBounds, targetCoefficients, whiteNoiseValue } from './statistic';
import type { TargetFit } from './fit';

export interface TargetOptions {
	/** The target's Schmidt coefficients λ, declared before the data (any scale, not increasing). */
	target: number[];
	confidence?: number;
	claim?: number;
	inputSha256?: string;
}

export interface TargetResult {
	method: 'fidelity-target';
	dimension: number;
	/** Basis 0 the computational table, 1 the tilted-vector table (what a certificate lists). */
	bases: [0, 1];
	/** λ scaled to Σλ² = 1. */
	target: number[];
	statistic: {
		value: number;
		lower: number;
		interval95: [number, number];
		boundMethod: 'target-cell-limits';
		boundNote: string;
	};
	bounds: { upToSchmidtNumber: number; bound: number; criticalVisibility: number }[];
	pointSchmidtNumber: number;
	certifiedSchmidtNumber: number;
	confidence: number;
	claim: { schmidtNumber: number; verdict: 'supported' | 'not supported' } | null;
	effectiveVisibility: number;
	/** Pairs in both tables (the computational total normalises the tilted matches). */
	totalCounts: number;
	inputSha256: string | null;
	warnings: string[];
	/** The version that re-runs it bit for bit (exact limits: no seed, no resamples). */
	engine: { version: string };
	/** Set when λ was fitted on a separate calibration run (fitted.ts): the run's hash and fit. */
	targetFit?: TargetFit;
}

function targetData(dataset: CountsDataset) {
	const d = dataset.dimension;
	requireCompleteTables(dataset, [0, 1], 'fidelity-target');
	const [computational, tilted] = [0, 1].map((t) => dataset.tables.find((x) => x.basis === t)!);
	if ([computational, tilted].some((t) => t.durations !== null || t.accidentals !== null))
		throw new InputError(
			'fidelity-target needs raw counts at equal integration time (no duration_s or accidentals column)'
		);
	return {
		totalCounts: [computational, tilted].reduce(
			(s, t) => s + t.counts.reduce((a, c) => a + c, 0),
			0
		),
		computational: computational.counts,
		tilted: Array.from({ length: d }, (_, j) => tilted.counts[j * d + j])
	};
}

export function certifyTarget(dataset: CountsDataset, o: TargetOptions): TargetResult {
	const d = dataset.dimension;
	const lambda = targetCoefficients(o.target, d);
	const confidence = o.confidence ?? CONFIDENCE.default;
	if (!(confidence > CONFIDENCE.above && confidence < CONFIDENCE.below))
		throw new InputError(
			`confidence must lie strictly between ${CONFIDENCE.above} and ${CONFIDENCE.below}`
		);
	if (o.claim !== undefined && !(Number.isInteger(o.claim) && o.claim >= 1 && o.claim <= d))
		throw new InputError(`claim must be a Schmidt number from 1 to the dimension ${d}`);
	const { totalCounts, ...data } = targetData(dataset);
	const value = targetPointValue(data, lambda);
	const lower = targetLowerBound(data, lambda, 1 - confidence);
	const bounds = targetBounds(lambda);
	const white = whiteNoiseValue(lambda);
	const visibility = (x: number) => (x - white) / (1 - white);
	const certified = ladderPosition(lower, bounds);
	return {
		method: 'fidelity-target',
		dimension: d,
		bases: [0, 1],
		target: Array.from(lambda),
		statistic: {
			value,
			lower,
			interval95: [targetLowerBound(data, lambda, 0.025), targetUpperBound(data, lambda, 0.025)],
			boundMethod: 'target-cell-limits',
			boundNote:
				'Lower bound from exact limits: the tilted matching total over the computational pair total (Clopper–Pearson on the conditional binomial, α/2) and every off-diagonal computational cell (Clopper–Pearson, α/(2·d(d − 1)) each), combined by the union bound.'
		},
		bounds: bounds.map((bound, i) => ({
			upToSchmidtNumber: i + 1,
			bound,
			criticalVisibility: visibility(bound)
		})),
		pointSchmidtNumber: ladderPosition(value, bounds),
		certifiedSchmidtNumber: certified,
		confidence,
		claim:
			o.claim === undefined
				? null
				: { schmidtNumber: o.claim, verdict: certified >= o.claim ? 'supported' : 'not supported' },
		effectiveVisibility: visibility(value),
		totalCounts,
		inputSha256: o.inputSha256 ?? null,
		warnings: [
			'The tilted matches are normalised by the computational pair total: both tables must have the same integration time and detection efficiency (witnesses.md §4.3′).'
		],
		engine: { version: ENGINE_VERSION }
	};
}
