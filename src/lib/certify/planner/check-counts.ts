/**
 * "Counts needed" on a check's verdict: the same simulation as the planner's, with the check's
 * own tables as the model of the state and its own proportions between bases.
 */
import type { SimulatedCounts } from '../ladder';
import { normalGuess, observedModel } from './design';
import { countsForPower, POWER_SIMULATION, type Engine, type PowerDesign } from './power';
import type { CertificationPlan } from '../plan';

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

export function countsForCheck(plan: CertificationPlan, engine: Engine): SimulatedCounts | null {
	const { d, bases, tables, method, confidence, claim } = plan;
	const settings = POWER_SIMULATION;
	const cost = simulationCost(d, bases.length, settings.resamples, method === 'fidelity-two-basis');
	if (claim === undefined || plan.inputs.perCell || cost > SIMULATION_COST_CAP) return null;
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
		schmidtNumber: claim
	};
	const start = normalGuess(design, settings.target) ?? largest;
	const found = countsForPower(engine, design, start, largest * CEILING_FACTOR, settings);
	if (!found) return null;
	const total = weights.reduce((s, w) => s + Math.round(found.scale * w), 0);
	return { totalCounts: total, power: found.power, experiments: settings.experiments };
}
