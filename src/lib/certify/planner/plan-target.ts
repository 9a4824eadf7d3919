/**
 * The planner for fidelity-target (witnesses.md §4.3′): with the declared λ and white noise at
 * visibility η (ρ = η·Φ_λ + (1 − η)·𝟙/d²), F̃(η) = η + (1 − η)·w with w the white-noise value of
 * F̃, so rung r is cleared above η*_r = (B_r − w)/(1 − w); the computational pairs for 90 % power
 * come from simulating the very check (exact limits) on Poisson tables of that state.
 */
import { DEFAULTS } from '../certify';
import { InputError } from '../counts';
import {
	certifyTarget,
	targetBounds,
	targetCoefficients,
	whiteNoiseValue
} from '../fidelity-target';
import { targetState } from '../fidelity-target/states';
import { CONFIDENCE } from '../limits';
import { countsForPower, POWER_SIMULATION, type Engine, type PowerDesign } from './power';
import { PLAN_COUNTS_CEILING } from './plan-experiment';

export interface TargetPlanRequest {
	/** λ as declared (scaled to Σλ² = 1). */
	target: number[];
	schmidtNumber: number;
	visibility: number;
	confidence?: number;
}

export interface TargetPlan {
	request: Required<TargetPlanRequest> & { method: 'fidelity-target'; dimension: number };
	rungs: { upToSchmidtNumber: number; bound: number; criticalVisibility: number }[];
	criticalVisibility: number;
	/** Pairs in the computational table (the tilted table at the same integration time) for 90 % power. */
	pairsNeeded: number | null;
	power: number | null;
	note: string | null;
	simulation: typeof POWER_SIMULATION & { engine: 'certifyTarget' };
}

export function planTarget(request: TargetPlanRequest): TargetPlan {
	const d = request.target.length;
	const lambda = targetCoefficients(request.target, d);
	const k = request.schmidtNumber;
	if (!Number.isInteger(k) || k < 2 || k > d)
		throw new InputError(`schmidtNumber must be a whole number from 2 to ${d}, got ${k}`);
	const { visibility: eta } = request;
	if (!(eta >= 0 && eta <= 1)) throw new InputError(`visibility must lie from 0 to 1, got ${eta}`);
	const confidence = request.confidence ?? DEFAULTS.confidence;
	if (!(confidence > CONFIDENCE.above && confidence < CONFIDENCE.below))
		throw new InputError(
			`confidence must lie strictly between ${CONFIDENCE.above} and ${CONFIDENCE.below}`
		);
	const w = whiteNoiseValue(lambda);
	const rungs = targetBounds(lambda).map((bound, i) => ({
		upToSchmidtNumber: i + 1,
		bound,
		criticalVisibility: (bound - w) / (1 - w)
	}));
	const critical = rungs[k - 2].criticalVisibility;
	const base = {
		request: { ...request, confidence, method: 'fidelity-target' as const, dimension: d },
		rungs,
		criticalVisibility: critical,
		simulation: { ...POWER_SIMULATION, engine: 'certifyTarget' as const }
	};
	if (!(eta > critical))
		return {
			...base,
			pairsNeeded: null,
			power: null,
			note: 'The visibility does not exceed the critical visibility: no number of counts helps.'
		};
	const state = targetState('plan', request.target, request.target, eta, d, true);
	const engine: Engine = (data, o) =>
		certifyTarget(data, { target: request.target, confidence: o.confidence });
	const design: PowerDesign = {
		method: 'fidelity-target',
		dimension: d,
		bases: [0, 1],
		confidence,
		model: [state.table(0), state.table(1)],
		weights: [1, 1],
		schmidtNumber: k
	};
	const found = countsForPower(engine, design, 1000, PLAN_COUNTS_CEILING, POWER_SIMULATION);
	if (!found)
		return {
			...base,
			pairsNeeded: null,
			power: null,
			note: `Not reached below ${PLAN_COUNTS_CEILING.toExponential(0)} pairs.`
		};
	return { ...base, pairsNeeded: found.scale, power: found.power, note: null };
}
