/**
 * The first half of a check: options, bases, tables and the refusal tests, up to what the bound
 * draws (a DrawSpec: plain data, so that worker threads can draw it; certify.ts finishes).
 */
import {
	DEFAULT_FOURIER,
	fourierProblem,
	isFourierConvention,
	type FourierConvention
} from './bases';
import { hasUnequalDurations } from './cell-model';
import type { DrawSpec } from './confidence';
import {
	checkDeclaredFourier,
	InputError,
	requireCompleteTables,
	type CountsDataset,
	type CountTable
} from './counts';
import { CONFIDENCE, RESAMPLES, resamplesProblem, tooFewResamplesProblem } from './limits';
import { checkQuantumMarginals, type EntropicSum } from './physical';
import {
	calibratedPairLimit,
	calibrationSummary,
	type Calibration,
	type CalibrationSummary
} from './calibration';
import { checkSeed } from './poisson';
import { boundDrawSpec, usesReplicates, type BoundInputs } from './statistic-bound';
import { isMethodId, witnessFamilies, type MethodId, type WitnessFamily } from './witnesses';

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
	/** Measured basis vectors (witnesses.md §4.4): the ladder then uses their overlaps. */
	calibration?: Calibration;
	/** SHA-256 of the calibration file's bytes, recorded on the result. */
	calibrationSha256?: string;
	onProgress?: (fraction: number) => void;
}

export interface CertificationPlan {
	method: MethodId;
	family: WitnessFamily;
	d: number;
	bases: number[];
	fourier: FourierConvention;
	tables: CountTable[];
	confidence: number;
	resamples: number;
	seed: number;
	claim: number | undefined;
	subtract: boolean;
	rates: boolean;
	entropicSums: EntropicSum[];
	/** The bound's inputs (without replicates) and what it draws. */
	inputs: BoundInputs;
	draws: DrawSpec;
	/** Whether the bound reads replicates (rates, subtracted accidentals); else none are drawn. */
	replicated: boolean;
	inputSha256: string | null;
	calibration: CalibrationSummary | null;
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

/** The bases the check reads (given, else the family's default), each with a complete table. */
function chosenBases(
	dataset: CountsDataset,
	options: CertifyOptions,
	family: WitnessFamily,
	fourier: FourierConvention
): number[] {
	const d = dataset.dimension;
	const present = dataset.tables.map((t) => t.basis);
	const bases = options.bases ?? family.defaultBases(present, d);
	try {
		family.checkBases(bases, d, fourier);
	} catch (error) {
		throw new InputError(`bases: ${(error as Error).message}`);
	}
	requireCompleteTables(dataset, bases, options.method as MethodId);
	return bases;
}

/** Whether accidentals are subtracted and whether counts are read as rates (unequal durations). */
function cellModel(tables: CountTable[], options: CertifyOptions) {
	const subtract = !!options.subtractAccidentals && tables.some((t) => t.accidentals !== null);
	if (options.subtractAccidentals && !subtract)
		throw new InputError('subtracting accidentals needs an accidentals column');
	return { subtract, rates: hasUnequalDurations(tables) };
}

export function planCertification(
	dataset: CountsDataset,
	options: CertifyOptions
): CertificationPlan {
	const d = dataset.dimension;
	const { method, confidence, resamples, seed, claim } = checkOptions(options, d);
	const family = witnessFamilies[method];
	const fourier = fourierOf(dataset, options.fourier);
	const bases = chosenBases(dataset, options, family, fourier);
	const calibration = options.calibration
		? calibrationSummary(options.calibration, {
				method,
				d,
				bases,
				sha256: options.calibrationSha256
			})
		: null;
	const tables = bases.map((t) => dataset.tables.find((x) => x.basis === t)!);
	const { subtract, rates } = cellModel(tables, options);
	const perCell = subtract || rates;
	const fidelity = method === 'fidelity-two-basis';
	const replicated = usesReplicates({ perCell });
	checkResamples(resamples, confidence, { d, bases: bases.length, perCell, fidelity, replicated });
	const entropicSums = rates
		? []
		: checkQuantumMarginals(
				tables,
				d,
				family.trust === 'device-dependent' ? ['A', 'B'] : ['B'],
				options.calibration ? calibratedLimit(options.calibration, bases) : undefined
			);
	const { onProgress } = options;
	const inputs: BoundInputs = {
		...{ family, tables, d, bases, fourier, confidence, resamples, seed, onProgress },
		...{ perCell, subtractAccidentals: subtract }
	};
	const draws = boundDrawSpec(inputs, fidelity);
	const inputSha256 = options.inputSha256 ?? null;
	return {
		...{ method, family, d, bases, fourier, tables, confidence, resamples, seed, claim },
		...{ subtract, rates, entropicSums, inputs, draws, replicated, inputSha256, calibration }
	};
}

interface ResampleNeeds {
	d: number;
	bases: number;
	perCell: boolean;
	fidelity: boolean;
	replicated: boolean;
}

/** Too few for the level (bounds read off replicates), or too many for a per-cell table's work. */
function checkResamples(resamples: number, confidence: number, o: ResampleNeeds): void {
	const tooFew = o.replicated ? tooFewResamplesProblem(resamples, confidence, o.fidelity) : null;
	if (tooFew) throw new InputError(tooFew);
	// Per-cell work grows with cells × resamples: refuse before any draw (limits.ts).
	const tooMany = o.perCell ? resamplesProblem(resamples, o.d, o.bases) : null;
	if (tooMany) throw new InputError(tooMany);
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

/** The refusal test's limits from the calibrated overlaps (the bases are in the check's order). */
function calibratedLimit(calibration: Calibration, bases: number[]) {
	const used = bases.map((t) => calibration.bases.find((b) => b.basis === t)!);
	return calibratedPairLimit(used, calibration.dimension, calibration.tolerance);
}
