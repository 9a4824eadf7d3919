/**
 * From count tables and a method to a Schmidt-number certificate (witnesses.md §3–§7).
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { hasUnequalDurations } from './cell-model';
import {
	DEFAULT_FOURIER,
	fourierProblem,
	isFourierConvention,
	type FourierConvention
} from './bases';
import {
	checkDeclaredFourier,
	InputError,
	requireCompleteTables,
	type CountsDataset
} from './counts';
import { claimVerdict, ladderPosition, marginsInStandardErrors, type ClaimVerdict } from './ladder';
import { CONFIDENCE, RESAMPLES, resamplesProblem } from './limits';
import { checkQuantumMarginals, type EntropicSum } from './physical';
import { checkSeed } from './poisson';
import { correlationSumBound, fidelityBound, type StatisticBound } from './statistic-bound';
import { warningsFor } from './warnings';
import { noiseScale, visibilityOf } from './visibility';
import { isMethodId, witnessFamilies, type MethodId, type Trust } from './witnesses';

export const ENGINE_VERSION = '2.0.0';

export const DEFAULTS = {
	confidence: CONFIDENCE.default,
	resamples: RESAMPLES.default,
	seed: 1
} as const;

export interface CertifyOptions {
	method: MethodId | string;
	bases?: number[];
	/** Which Fourier basis basis 1 is; default: the file's declaration, else cyclic. */
	fourier?: FourierConvention;
	confidence?: number;
	resamples?: number;
	seed?: number;
	claim?: number;
	/** Subtract the file's accidental estimates; the result is then labelled background-subtracted. */
	subtractAccidentals?: boolean;
	inputSha256?: string;
	onProgress?: (fraction: number) => void;
}

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
	warnings: string[];
	engine: { version: string; generator: string; poisson: string; gamma: string };
}

function checkOptions(options: CertifyOptions, d: number) {
	if (!isMethodId(options.method)) {
		throw new InputError(
			`method must be one of ${Object.keys(witnessFamilies).join(', ')}, got '${options.method}'`
		);
	}
	const confidence = options.confidence ?? DEFAULTS.confidence;
	if (!(confidence > CONFIDENCE.above && confidence < CONFIDENCE.below))
		throw new InputError(
			`confidence must lie strictly between ${CONFIDENCE.above} and ${CONFIDENCE.below}, got ${confidence}`
		);
	const resamples = options.resamples ?? DEFAULTS.resamples;
	if (!Number.isInteger(resamples) || resamples < RESAMPLES.min || resamples > RESAMPLES.max) {
		throw new InputError(
			`resamples must be a whole number from ${RESAMPLES.min} to ${RESAMPLES.max}, got ${resamples}`
		);
	}
	const seed = options.seed ?? DEFAULTS.seed;
	try {
		checkSeed(seed);
	} catch (error) {
		throw new InputError((error as Error).message);
	}
	const claim = options.claim;
	if (claim !== undefined && (!Number.isInteger(claim) || claim < 1 || claim > d)) {
		throw new InputError(
			`claim must be a Schmidt number from 1 to the dimension ${d}, got ${claim}`
		);
	}
	return { method: options.method, confidence, resamples, seed, claim };
}

export function certify(dataset: CountsDataset, options: CertifyOptions): CertificationResult {
	const d = dataset.dimension;
	const { method, confidence, resamples, seed, claim } = checkOptions(options, d);
	const family = witnessFamilies[method];
	const fourier = fourierOf(dataset, options.fourier);
	const present = dataset.tables.map((t) => t.basis);
	const bases = options.bases ?? family.defaultBases(present, d);
	try {
		family.checkBases(bases, d, fourier);
	} catch (error) {
		throw new InputError(`bases: ${(error as Error).message}`);
	}
	const tooMany = resamplesProblem(resamples, d, bases.length);
	if (tooMany) throw new InputError(tooMany);
	requireCompleteTables(dataset, bases, method);
	const tables = bases.map((t) => dataset.tables.find((x) => x.basis === t)!);
	const subtract = !!options.subtractAccidentals && tables.some((t) => t.accidentals !== null);
	if (options.subtractAccidentals && !subtract)
		throw new InputError('subtracting accidentals needs an accidentals column');
	const rates = hasUnequalDurations(tables);
	const entropicSums = rates
		? []
		: checkQuantumMarginals(tables, d, family.trust === 'device-dependent' ? ['A', 'B'] : ['B']);
	const fidelity = method === 'fidelity-two-basis';
	const statistic = (fidelity ? fidelityBound : correlationSumBound)({
		family,
		tables,
		d,
		bases,
		fourier,
		confidence,
		resamples,
		seed,
		onProgress: options.onProgress,
		perCell: subtract || rates,
		subtractAccidentals: subtract
	});
	const { value, lower, standardError } = statistic;
	const bounds = family.bounds(d, bases);
	const scale = noiseScale(family, d, bases);
	const margins = marginsInStandardErrors(value, bounds, standardError);
	const criticalVisibilities = bounds.map((b) => visibilityOf(b, scale));
	const certified = ladderPosition(lower, bounds);
	const effectiveVisibility = visibilityOf(value, scale);
	const totalCounts = tables.reduce((s, t) => s + t.counts.reduce((a, c) => a + c, 0), 0);
	const extras = family.extras?.(value, lower, d);
	return {
		method,
		dimension: d,
		bases,
		fourier,
		statistic,
		bounds: bounds.map((bound, i) => ({
			upToSchmidtNumber: i + 1,
			bound,
			marginInStandardErrors: margins[i],
			criticalVisibility: criticalVisibilities[i]
		})),
		pointSchmidtNumber: ladderPosition(value, bounds),
		certifiedSchmidtNumber: certified,
		confidence,
		resamples,
		seed,
		inputSha256: options.inputSha256 ?? null,
		claim:
			claim === undefined
				? null
				: claimVerdict({
						claim,
						certified,
						value,
						boundBasisValue: statistic.floorValue ?? value,
						boundBasisName: fidelity ? 'the floor P₀ + P₁ − 1' : 'the statistic',
						standardError,
						bounds,
						criticalVisibilities,
						effectiveVisibility,
						totalCounts,
						z: normalQuantile(fidelity ? 1 - (1 - confidence) / 2 : confidence, 0, 1)
					}),
		effectiveVisibility,
		steeringRobustness: extras
			? { value: extras.steeringRobustness, lower: extras.steeringRobustnessLower }
			: null,
		trust: family.trust,
		reference: family.reference,
		normalisation: rates ? 'rates' : 'counts',
		backgroundSubtracted: subtract,
		resampling: subtract || rates ? 'per-cell' : 'sufficient-totals',
		totalCounts,
		entropicSums,
		warnings: warningsFor({ method, d, fourier, subtract, rates, resamples, confidence }),
		engine: {
			version: ENGINE_VERSION,
			generator: 'xoroshiro128+ (pure-rand) seeded through SplitMix32, 32-bit uniforms',
			poisson:
				'inversion by sequential search below mean 10, PTRS (Hörmann 1993) from 10 (simulator)',
			gamma:
				'Marsaglia–Tsang (2000) with Box–Muller normals; bounds from Beta/Gamma confidence-distribution draws'
		}
	};
}

/** The convention in force: the option, else the file's declaration, else cyclic; checked against both. */
function fourierOf(dataset: CountsDataset, requested: unknown): FourierConvention {
	if (requested !== undefined && !isFourierConvention(requested))
		throw new InputError(`fourier must be cyclic or field, got '${String(requested)}'`);
	const fourier = requested ?? dataset.declaredFourier?.convention ?? DEFAULT_FOURIER;
	const problem = fourierProblem(dataset.dimension, fourier);
	if (problem) throw new InputError(problem);
	checkDeclaredFourier(dataset, fourier, 'the check');
	return fourier;
}
