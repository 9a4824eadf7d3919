/**
 * "Counts needed" for a finished check whose claim is not supported but would be with more counts:
 * the planner's simulation with the check's own tables as the model of the state and its own
 * proportions between bases. Run once after the check (the check worker, the command line) and
 * stored beside the result, never inside `certify`, which issuing and the offline verifiers re-run.
 */
import { certify, type CertificationResult, type CertifyOptions } from '../certify';
import type { CountsDataset } from '../counts';
import { planCertification } from '../plan';
import { normalGuess, observedModel } from './design';
import { countsForPower, POWER_SIMULATION, type Engine, type PowerDesign } from './power';

/** Draws one simulated check costs, roughly: the bound's Beta draws and the table's cells. */
export function simulationCost(
	d: number,
	basisCount: number,
	resamples: number,
	fidelity: boolean
) {
	return resamples * basisCount * 8 + d * d * basisCount * (fidelity ? 40 : 4);
}

/** Simulations inside one check (or one web request) stay below this many draws per experiment. */
export const SIMULATION_COST_CAP = 200_000;

/** Searched up to this multiple of the data's counts. */
const CEILING_FACTOR = 1e4;

/** What a finished check adds to an unsupported verdict: the counts for a 90 % chance. */
export interface CountsAdvice {
	schmidtNumber: number;
	/** Total counts in the data's proportions; null when not found (see `reason`). */
	totalCounts: number | null;
	/** totalCounts over the data's total counts. */
	factor: number | null;
	/** The simulated probability of certifying the claim at totalCounts. */
	power: number | null;
	experiments: number;
	resamples: number;
	/** Why no figure is given, in one sentence; null with a figure. */
	reason: string | null;
}

const PLANNER = 'the planner (/plan, npm run plan) gives them for a white-noise model';

function withoutFigure(schmidtNumber: number, reason: string): CountsAdvice {
	const { experiments, resamples } = POWER_SIMULATION;
	return {
		schmidtNumber,
		totalCounts: null,
		factor: null,
		power: null,
		experiments,
		resamples,
		reason
	};
}

/**
 * The advice for a check run with `options` on `dataset` that gave `result`; null unless the
 * verdict says more counts would help. Bounded: too costly a simulated check, or no level up to
 * CEILING_FACTOR times the data's counts, gives the reason instead of a figure.
 */
export function countsAdvice(
	dataset: CountsDataset,
	options: CertifyOptions,
	result: CertificationResult
): CountsAdvice | null {
	const verdict = result.claim;
	if (!verdict || verdict.verdict !== 'not supported' || !verdict.moreCountsHelp) return null;
	const k = verdict.schmidtNumber;
	const plan = planCertification(dataset, { ...options, claim: k });
	const { d, bases, tables, method, confidence } = plan;
	const settings = POWER_SIMULATION;
	const cost = simulationCost(d, bases.length, settings.resamples, method === 'fidelity-two-basis');
	if (plan.inputs.perCell)
		return withoutFigure(k, `Rates or subtracted accidentals are not simulated; ${PLANNER}.`);
	if (cost > SIMULATION_COST_CAP)
		return withoutFigure(
			k,
			`The counts needed are too costly to simulate for one check; ${PLANNER}.`
		);
	const { model, weights: totals } = observedModel(tables);
	const largest = Math.max(...totals);
	// The scale searched is the largest basis's total; the others keep their proportion to it.
	const weights = totals.map((t) => t / largest);
	const design: PowerDesign = {
		method,
		dimension: d,
		bases,
		confidence,
		model,
		weights,
		schmidtNumber: k
	};
	// The simulated checks are this check at other counts: same Fourier convention and calibration.
	const engine: Engine = (data, o) =>
		certify(data, { ...o, fourier: plan.fourier, calibration: options.calibration });
	const start = normalGuess(design, settings.target) ?? largest;
	const found = countsForPower(engine, design, start, largest * CEILING_FACTOR, settings);
	if (!found)
		return withoutFigure(
			k,
			`Even ${CEILING_FACTOR.toExponential(0)} times the data's counts fall short of a 90 % chance in simulation.`
		);
	const total = weights.reduce((s, w) => s + Math.round(found.scale * w), 0);
	return {
		schmidtNumber: k,
		totalCounts: total,
		factor: total / result.totalCounts,
		power: found.power,
		experiments: settings.experiments,
		resamples: settings.resamples,
		reason: null
	};
}

/** The advice in one sentence, for the command line and the check page. */
export function adviceInWords(a: CountsAdvice, dataTotal: number): string {
	if (a.totalCounts === null) return a.reason ?? '';
	return (
		`About ${a.totalCounts.toExponential(2)} counts in all (×${a.factor!.toFixed(2)} the data's ${dataTotal.toLocaleString('en')}), ` +
		`in the same proportions, certify Schmidt number ${a.schmidtNumber} in ${(100 * a.power!).toFixed(1)} % of ${a.experiments} simulated checks.`
	);
}
