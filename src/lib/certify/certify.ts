/**
 * From count tables and a method to a Schmidt-number certificate (witnesses.md §3–§7).
 */
import type { FourierConvention } from './bases';
import type { DrawSpec, Replicates } from './confidence';
import type { CountsDataset } from './counts';
import { claimVerdict, ladderPosition, marginsInStandardErrors, type ClaimVerdict } from './ladder';
import type { EntropicSum } from './physical';
import { planCertification, type CertificationPlan, type CertifyOptions } from './plan';
import { correlationSumBound, fidelityBound, type StatisticBound } from './statistic-bound';
import { warningsFor } from './warnings';
import {
	calibratedBounds,
	calibrationTolerance,
	type CalibrationSummary,
	type CalibrationTolerance
} from './calibration';
import { noiseScale, visibilityOf } from './visibility';
import type { MethodId, Trust } from './witnesses';

export { DEFAULTS, planCertification, type CertificationPlan, type CertifyOptions } from './plan';

/** Draws all blocks of replicates of a spec (in any threads) and returns them in order. */
export type BlockRunner = (spec: DrawSpec, resamples: number, seed: number) => Promise<Replicates>;

export const ENGINE_VERSION = '3.2.0';

export interface BoundRung {
	upToSchmidtNumber: number;
	bound: number;
	marginInStandardErrors: number | null;
	criticalVisibility: number;
}

export interface CertificationResult {
	method: MethodId;
	dimension: number;
	bases: number[];
	fourier: FourierConvention;
	statistic: StatisticBound;
	bounds: BoundRung[];
	pointSchmidtNumber: number;
	certifiedSchmidtNumber: number;
	confidence: number;
	resamples: number;
	seed: number;
	inputSha256: string | null;
	claim: ClaimVerdict | null;
	effectiveVisibility: number;
	steeringRobustness: { value: number; lower: number } | null;
	trust: Trust;
	reference: string;
	normalisation: 'counts' | 'rates';
	backgroundSubtracted: boolean;
	resampling: 'sufficient-totals' | 'per-cell';
	totalCounts: number;
	/** Plug-in Maassen–Uffink sums on each trusted side (information; the refusal test is exact). */
	entropicSums: EntropicSum[];
	/** The measured bases the ladder used (witnesses.md §4.4), or null for the declared bases. */
	calibration: CalibrationSummary | null;
	/** Correlation sums: how far from unbiased the bases may be for the certificate to hold. */
	calibrationTolerance: CalibrationTolerance | null;
	warnings: string[];
	engine: { version: string; generator: string; poisson: string; gamma: string };
}

export function certify(dataset: CountsDataset, options: CertifyOptions): CertificationResult {
	const plan = planCertification(dataset, options);
	return finishCertification(plan);
}

/** Draws the blocks of replicates with `runBlocks` (worker threads in the CLI): same numbers. */
export async function certifyInBlocks(
	dataset: CountsDataset,
	options: CertifyOptions,
	runBlocks: BlockRunner
): Promise<CertificationResult> {
	const plan = planCertification(dataset, options);
	if (!plan.replicated) return finishCertification(plan);
	const replicates = await runBlocks(plan.draws, plan.resamples, plan.seed);
	if (replicates.lower.length !== plan.resamples || replicates.upper.length !== plan.resamples)
		throw new Error(
			`the block runner returned ${replicates.lower.length} replicates, not ${plan.resamples}`
		);
	return finishCertification(plan, replicates);
}

/** The second half of a check: the bound from the replicates (drawn here unless given), the words. */
export function finishCertification(
	plan: CertificationPlan,
	replicates?: Replicates
): CertificationResult {
	const { method, family, d, bases, fourier, confidence, resamples, seed } = plan;
	const { subtract, rates, entropicSums, calibration } = plan;
	const bound = method === 'fidelity-two-basis' ? fidelityBound : correlationSumBound;
	const statistic = bound({ ...plan.inputs, replicates });
	const ladder = ladderOf(plan, statistic);
	const extras = family.extras?.(statistic.value, statistic.lower, d);
	return {
		method,
		dimension: d,
		bases,
		fourier,
		statistic,
		bounds: ladder.rungs,
		pointSchmidtNumber: ladderPosition(statistic.value, ladder.bounds),
		certifiedSchmidtNumber: ladder.certified,
		confidence,
		resamples,
		seed,
		inputSha256: plan.inputSha256,
		claim: verdictOf(plan, statistic, ladder),
		effectiveVisibility: ladder.effectiveVisibility,
		steeringRobustness: extras
			? { value: extras.steeringRobustness, lower: extras.steeringRobustnessLower }
			: null,
		trust: family.trust,
		reference: family.reference,
		normalisation: rates ? 'rates' : 'counts',
		backgroundSubtracted: subtract,
		resampling: subtract || rates ? 'per-cell' : 'sufficient-totals',
		totalCounts: ladder.totalCounts,
		entropicSums,
		calibration,
		...cautionsOf(plan, statistic.lower, ladder.certified),
		engine: { version: ENGINE_VERSION, ...ENGINE_DETAILS }
	};
}

/** How the engine draws, recorded in every result. */
const ENGINE_DETAILS = {
	generator:
		'xoroshiro128+ (pure-rand), one stream per block of 1000 resamples seeded through SplitMix32 from (seed, block), 32-bit uniforms',
	poisson: 'inversion by sequential search below mean 10, PTRS (Hörmann 1993) from 10 (simulator)',
	gamma:
		'−ln of a product of uniforms for whole shapes up to 4, Marsaglia–Tsang (2000) with Box–Muller normals above; bounds from Beta/Gamma confidence-distribution draws, raw-count sums from their Beta confidence distributions convolved on a grid (no draws)'
};

type Ladder = ReturnType<typeof ladderOf>;

/** The separable bounds (declared or calibrated bases), where the statistic and its bound sit on them. */
function ladderOf(plan: CertificationPlan, statistic: StatisticBound) {
	const { family, d, bases, tables, calibration } = plan;
	const { value, lower, standardError } = statistic;
	const bounds = calibration
		? calibratedBounds(calibration.muPlus, bases.length, d)
		: family.bounds(d, bases);
	const scale = noiseScale(family, d, bases);
	const margins = marginsInStandardErrors(value, bounds, standardError);
	const criticalVisibilities = bounds.map((b) => visibilityOf(b, scale));
	const rungs: BoundRung[] = bounds.map((bound, i) => ({
		upToSchmidtNumber: i + 1,
		bound,
		marginInStandardErrors: margins[i],
		criticalVisibility: criticalVisibilities[i]
	}));
	return {
		bounds,
		rungs,
		criticalVisibilities,
		certified: ladderPosition(lower, bounds),
		effectiveVisibility: visibilityOf(value, scale),
		totalCounts: tables.reduce((s, t) => s + t.counts.reduce((a, c) => a + c, 0), 0)
	};
}

/** The verdict on the claimed Schmidt number, when one was claimed. */
function verdictOf(plan: CertificationPlan, statistic: StatisticBound, ladder: Ladder) {
	if (plan.claim === undefined) return null;
	const { value, standardError } = statistic;
	return claimVerdict({
		claim: plan.claim,
		certified: ladder.certified,
		// Whether more counts could help: judged on the plug-in, the value's large-count limit.
		value: statistic.plugInValue ?? value,
		boundBasisValue: statistic.floorValue ?? value,
		boundBasisName:
			plan.method === 'fidelity-two-basis' ? 'the floor P₀ + P₁ − 1' : 'the statistic',
		standardError,
		bounds: ladder.bounds,
		criticalVisibilities: ladder.criticalVisibilities,
		effectiveVisibility: ladder.effectiveVisibility
	});
}

/** The calibration tolerance and the cautions that go with the result. */
function cautionsOf(plan: CertificationPlan, lower: number, certified: number) {
	const { method, d, bases, fourier, subtract, rates, resamples, confidence } = plan;
	const calibrated = plan.calibration !== null;
	return {
		calibrationTolerance: calibrationTolerance({
			method,
			lower,
			certified,
			m: bases.length,
			d,
			calibrated
		}),
		warnings: warningsFor({
			method,
			d,
			fourier,
			subtract,
			rates,
			resamples,
			confidence,
			replicated: plan.replicated
		})
	};
}
