/**
 * The certificate from time-ordered trials (witnesses.md §10): per rung r a test supermartingale
 * against E[Z | past] ≤ B_r/m, its p-value, closed testing down the ladder, the settings' randomness
 * check and the i.i.d. certificate of the same trials summed, for comparison.
 */
import { DEFAULT_FOURIER, type FourierConvention } from '../bases';
import { certify, DEFAULTS, ENGINE_VERSION, type CertificationResult } from '../certify';
import { InputError } from '../counts';
import { CONFIDENCE } from '../limits';
import { witnessFamilies, type MethodId } from '../witnesses';
import { betAgainstEach, BET_CAP, closedTestingRung, pValue, unitsNeeded } from './martingale';
import { checkSettings, type SettingsCheck } from './settings-check';
import { iidDataset, settingsPlan, type SettingsPlan } from './settings-plan';
import { settingSequence, type TrialsData, type TrialsMode } from './store';

export const TRIALS_LABEL =
	'valid without the i.i.d. assumption; assumes random settings independent of the source; fair sampling of detected pairs';
export const BLOCKS_CONDITION =
	"one bet per block on the block's matching fraction: valid when each block's setting is chosen at random, independently of the source, and the source receives nothing from the detectors during the block";
/** Points of the running log₁₀ M_n kept per rung for the plot. */
export const TRACE_POINTS = 200;

export interface TrialsOptions {
	method: MethodId | string;
	/** The declared set K of settings; default: the bases present in the file. */
	bases?: number[];
	/** π_t in the order of `bases`; default uniform. */
	probabilities?: number[];
	fourier?: FourierConvention;
	confidence?: number;
	inputSha256?: string;
}

export interface TrialsRung {
	/** The null H_r: every state, whatever the past, has Schmidt number ≤ r. */
	rung: number;
	bound: number;
	/** B_r / m, the largest mean of Z under H_r. */
	nullMean: number;
	/** p_r = min(1, 1/max_n M_n); it may underflow to 0, log10P does not. */
	p: number;
	log10P: number;
	log10Final: number;
	/** log₁₀ M_n every `traceStep` trials (or blocks). */
	trace: number[];
	traceStep: number;
}

export interface TrialsResult {
	kind: 'time-ordered-trials';
	label: string;
	mode: TrialsMode;
	condition: string | null;
	method: MethodId;
	dimension: number;
	bases: number[];
	probabilities: number[];
	confidence: number;
	alpha: number;
	trials: number;
	blocks: number | null;
	betting: { rule: 'aGRAPA'; cap: number; reference: string };
	/** The observed mean of Z (per trial, or of the block fractions weighted per block). */
	meanZ: number;
	rungs: TrialsRung[];
	/** What the p-values alone give by closed testing. */
	ladderSchmidtNumber: number;
	/** The same unless the settings fail the randomness check: then 1 (nothing certified). */
	certifiedSchmidtNumber: number;
	/** The next rung: trials (or blocks) a fresh run at the observed rate would need for it. */
	next: { rung: number; unitsNeeded: number | null; unit: 'trials' | 'blocks' } | null;
	settings: SettingsCheck;
	iid: CertificationResult | { error: string };
	inputSha256: string | null;
	engine: { version: string };
}

/** Every rung in one pass over the data; closed testing then reads the ladder from below. */
function rungTests(plan: SettingsPlan, bounds: number[]): TrialsRung[] {
	const m = plan.bases.length;
	const mus = bounds.map((b) => b / m);
	const paths = betAgainstEach(plan.codes, plan.values, mus, plan.xMax, TRACE_POINTS);
	return paths.map((path, i) => ({
		rung: i + 1,
		bound: bounds[i],
		nullMean: mus[i],
		...pValue(path),
		log10Final: path.log10Final,
		trace: Array.from(path.trace),
		traceStep: path.traceStep
	}));
}

function iidComparison(data: TrialsData, options: TrialsOptions, bases: number[]) {
	try {
		return certify(iidDataset(data, bases), {
			method: options.method,
			bases,
			fourier: options.fourier,
			confidence: options.confidence,
			inputSha256: options.inputSha256
		});
	} catch (error) {
		return { error: (error as Error).message };
	}
}

export function certifyTrials(data: TrialsData, options: TrialsOptions): TrialsResult {
	const method = options.method;
	if (method !== 'mub-correlation' && method !== 'steering-2mub')
		throw new InputError(
			`time-ordered trials work with mub-correlation or steering-2mub (a sum of matching probabilities), got '${method}'`
		);
	const confidence = options.confidence ?? DEFAULTS.confidence;
	if (!(confidence > CONFIDENCE.above && confidence < CONFIDENCE.below))
		throw new InputError(
			`confidence must lie strictly between ${CONFIDENCE.above} and ${CONFIDENCE.below}, got ${confidence}`
		);
	const alpha = 1 - confidence;
	const family = witnessFamilies[method];
	const plan = settingsPlan(data, options.bases, options.probabilities);
	try {
		family.checkBases(plan.bases, data.dimension, options.fourier ?? DEFAULT_FOURIER);
	} catch (error) {
		throw new InputError(`bases: ${(error as Error).message}`);
	}
	const rungs = rungTests(plan, family.bounds(data.dimension, plan.bases));
	const ladder = closedTestingRung(
		rungs.map((r) => r.p),
		alpha
	);
	const settings = checkSettings(settingSequence(data), plan.bases, plan.probabilities);
	const nextRung = rungs[ladder - 1];
	return {
		kind: 'time-ordered-trials',
		label: TRIALS_LABEL,
		mode: data.mode,
		condition: data.mode === 'blocks' ? BLOCKS_CONDITION : null,
		method,
		dimension: data.dimension,
		bases: plan.bases,
		probabilities: plan.probabilities,
		confidence,
		alpha,
		trials: data.trials,
		blocks: data.blocks ? data.blocks.basis.length : null,
		betting: {
			rule: 'aGRAPA',
			cap: BET_CAP,
			reference: 'Waudby-Smith & Ramdas, J. R. Stat. Soc. B 86, 1 (2024)'
		},
		meanZ: plan.meanX,
		rungs,
		ladderSchmidtNumber: ladder,
		certifiedSchmidtNumber: settings.passed ? ladder : 1,
		next: nextRung
			? {
					rung: nextRung.rung,
					unitsNeeded: unitsNeeded(plan.codes, plan.values, nextRung.nullMean, alpha),
					unit: data.mode
				}
			: null,
		settings,
		iid: iidComparison(data, options, plan.bases),
		inputSha256: options.inputSha256 ?? null,
		engine: { version: ENGINE_VERSION }
	};
}

/** A stored check result from time-ordered trials (kept in the same column as the i.i.d. ones). */
export const isTrialsResult = (result: unknown): result is TrialsResult =>
	(result as { kind?: string } | null)?.kind === 'time-ordered-trials';
