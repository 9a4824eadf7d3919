/**
 * From count tables and a method to a Schmidt-number certificate (witnesses.md §3–§7).
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { bootstrapReplicates, summariseReplicates } from './bootstrap';
import { hasUnequalDurations, perCellModel } from './cell-model';
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
import { deltaMethodStandardError } from './model';
import { primePower } from './finite-field';
import { checkSeed } from './poisson';
import { noiseScale, visibilityOf } from './visibility';
import { isMethodId, witnessFamilies, type MethodId, type Trust } from './witnesses';

export const ENGINE_VERSION = '1.1.0';

export const DEFAULTS = { confidence: 0.99865, resamples: 10_000, seed: 1 } as const;

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
	statistic: {
		value: number;
		standardError: number;
		lower: number;
		interval95: [number, number];
		deltaMethodStandardError: number;
	};
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
	warnings: string[];
	engine: { version: string; generator: string; poisson: string };
}

function checkOptions(options: CertifyOptions, d: number) {
	if (!isMethodId(options.method)) {
		throw new InputError(
			`method must be one of ${Object.keys(witnessFamilies).join(', ')}, got '${options.method}'`
		);
	}
	const confidence = options.confidence ?? DEFAULTS.confidence;
	if (!(confidence > 0.5 && confidence < 1))
		throw new InputError(`confidence must lie strictly between 0.5 and 1, got ${confidence}`);
	const resamples = options.resamples ?? DEFAULTS.resamples;
	if (!Number.isInteger(resamples) || resamples < 100 || resamples > 1_000_000) {
		throw new InputError(`resamples must be a whole number from 100 to 1000000, got ${resamples}`);
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
	requireCompleteTables(dataset, bases, method);
	const tables = bases.map((t) => dataset.tables.find((x) => x.basis === t)!);
	const subtract = !!options.subtractAccidentals && tables.some((t) => t.accidentals !== null);
	if (options.subtractAccidentals && !subtract)
		throw new InputError('subtracting accidentals needs an accidentals column');
	const rates = hasUnequalDurations(tables);
	const model =
		subtract || rates
			? perCellModel(tables, d, (p) => family.statistic(p, d, bases, fourier), {
					subtractAccidentals: subtract
				})
			: family.sufficientModel(tables, d, bases, fourier);
	const value = model.statistic(model.means);
	const replicates = bootstrapReplicates(model, {
		resamples,
		seed,
		onProgress: options.onProgress
	});
	const summary = summariseReplicates(replicates, confidence);
	const bounds = family.bounds(d, bases);
	const scale = noiseScale(family, d, bases);
	const margins = marginsInStandardErrors(value, bounds, summary.standardError);
	const criticalVisibilities = bounds.map((b) => visibilityOf(b, scale));
	const certified = ladderPosition(summary.lower, bounds);
	const effectiveVisibility = visibilityOf(value, scale);
	const totalCounts = tables.reduce((s, t) => s + t.counts.reduce((a, c) => a + c, 0), 0);
	const extras = family.extras?.(value, summary.lower, d);
	return {
		method,
		dimension: d,
		bases,
		fourier,
		statistic: { value, ...summary, deltaMethodStandardError: deltaMethodStandardError(model) },
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
						standardError: summary.standardError,
						bounds,
						criticalVisibilities,
						effectiveVisibility,
						totalCounts,
						z: normalQuantile(confidence, 0, 1)
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
		warnings: warningsFor({
			subtract,
			rates,
			resamples,
			confidence,
			fourierNote: fourierNote(d, fourier)
		}),
		engine: {
			version: ENGINE_VERSION,
			generator: 'xoroshiro128+ (pure-rand), 32-bit uniforms',
			poisson: 'inversion by sequential search below mean 10, PTRS (Hörmann 1993) from 10'
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

/** What the result says about the convention where it is not the plain cyclic transform. */
function fourierNote(d: number, fourier: FourierConvention): string | null {
	if (fourier === 'cyclic') return null;
	return primePower(d)!.exponent === 1
		? `For prime d = ${d} the field and cyclic Fourier conventions give the same bases; the result holds for either.`
		: `fourier=field: basis 1 is the Fourier basis of the finite field GF(${d}) (outcomes labelled by base-p digits), not the cyclic one, and the fidelity method pairs cells digit-wise.`;
}

function warningsFor(o: {
	subtract: boolean;
	rates: boolean;
	resamples: number;
	confidence: number;
	fourierNote: string | null;
}): string[] {
	const out: string[] = [];
	if (o.fourierNote) out.push(o.fourierNote);
	if (o.subtract)
		out.push(
			'Background-subtracted: accidental estimates were removed before normalising; the raw-count certificate is the default.'
		);
	if (o.rates)
		out.push('Cells have different integration times: probabilities are normalised rates N/τ.');
	const tail = o.resamples * (1 - o.confidence);
	if (tail < 10)
		out.push(
			`Only ${tail.toFixed(1)} bootstrap replicates lie below the lower bound; use more resamples for a stable bound.`
		);
	return out;
}
