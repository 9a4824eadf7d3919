/**
 * The planner (issue 19, part 3): before measuring, which method, which bases and how many
 * counts certify Schmidt number k at a visibility? Critical visibilities come from each witness
 * family's own ladder (witnesses.md §7); counts for the target power from simulating the engine.
 */
import { availableBases } from '../bases';
import { certify, DEFAULTS } from '../certify';
import { checkDimension, InputError } from '../counts';
import { CONFIDENCE } from '../limits';
import { noiseScale, visibilityOf } from '../visibility';
import { METHOD_IDS, witnessFamilies, type MethodId, type Trust } from '../witnesses';
import { visibilityCurve, type CurvePoint } from './curve';
import { simulationCost } from './check-counts';
import { normalGuess, whiteNoiseTables } from './design';
import {
	countsForPower,
	POWER_SIMULATION,
	type PowerDesign,
	type SimulationSettings
} from './power';

export interface PlanRequest {
	method: MethodId;
	dimension: number;
	schmidtNumber: number;
	visibility: number;
	/** Basis indices, or 'all' for every basis the dimension has (default: the method's two). */
	bases?: number[] | 'all';
	confidence?: number;
	/** Which designs get simulated counts: the requested one, every one, or none (visibilities only). */
	simulate?: 'requested' | 'all' | 'none';
	settings?: SimulationSettings;
	/** Designs whose simulated check costs more draws than this get no counts (the web server's cap). */
	costCap?: number;
}

export interface DesignPlan {
	method: MethodId;
	trust: Trust;
	bases: number[];
	/** The visibility above which the rung for the requested k is cleared with infinite counts. */
	criticalVisibility: number;
	/** Counts per basis for the target power, simulated; null when not reachable or not simulated. */
	countsPerBasis: number | null;
	totalCounts: number | null;
	/** The simulated power at countsPerBasis. */
	power: number | null;
	/** Why there are no counts, when there are none. */
	note: string | null;
}

export interface ExperimentPlan {
	request: Required<Omit<PlanRequest, 'settings' | 'simulate' | 'bases' | 'costCap'>> & {
		bases: number[];
	};
	rungs: { upToSchmidtNumber: number; bound: number; criticalVisibility: number }[];
	design: DesignPlan;
	/** Other methods and basis sets for the same d, k and visibility: the trade-offs. */
	alternatives: DesignPlan[];
	curve: CurvePoint[];
	simulation: SimulationSettings & { target: number; engine: 'certify' };
}

/** Counts above this per basis are reported as out of reach. */
export const PLAN_COUNTS_CEILING = 1e10;

export function resolveBases(method: MethodId, d: number, bases: PlanRequest['bases']): number[] {
	const all = availableBases(d);
	const chosen = bases === 'all' ? all : (bases ?? witnessFamilies[method].defaultBases([0, 1], d));
	try {
		witnessFamilies[method].checkBases(chosen, d);
	} catch (error) {
		throw new InputError(`bases: ${(error as Error).message}`);
	}
	return chosen;
}

function criticalVisibilityOf(method: MethodId, d: number, bases: number[], k: number): number {
	const family = witnessFamilies[method];
	return visibilityOf(family.bounds(d, bases)[k - 2], noiseScale(family, d, bases));
}

function planDesign(
	method: MethodId,
	bases: number[],
	request: PlanRequest,
	simulate: boolean
): DesignPlan {
	const { dimension: d, schmidtNumber: k, visibility } = request;
	const criticalVisibility = criticalVisibilityOf(method, d, bases, k);
	const base = { method, trust: witnessFamilies[method].trust, bases, criticalVisibility };
	const none = (note: string): DesignPlan => ({
		...base,
		countsPerBasis: null,
		totalCounts: null,
		power: null,
		note
	});
	if (!(visibility > criticalVisibility))
		return none(
			'The visibility does not exceed the critical visibility: no number of counts helps.'
		);
	if (!simulate) return none('Not simulated here; ask for this design on its own.');
	const settings = request.settings ?? POWER_SIMULATION;
	const cost = simulationCost(d, bases.length, settings.resamples, method === 'fidelity-two-basis');
	if (cost > (request.costCap ?? Infinity))
		return none('Too large to simulate on the web server; npm run plan simulates it.');
	const design: PowerDesign = {
		method,
		dimension: d,
		bases,
		confidence: request.confidence ?? DEFAULTS.confidence,
		model: whiteNoiseTables(d, bases.length, visibility),
		weights: bases.map(() => 1),
		schmidtNumber: k
	};
	const start = normalGuess(design, POWER_SIMULATION.target) ?? 1000;
	const found = countsForPower(certify, design, start, PLAN_COUNTS_CEILING, settings);
	if (!found)
		return none(`Not reached below ${PLAN_COUNTS_CEILING.toExponential(0)} counts per basis.`);
	return {
		...base,
		countsPerBasis: found.scale,
		totalCounts: found.scale * bases.length,
		power: found.power,
		note: null
	};
}

/** Two-basis and all-bases designs of every method that accepts them, other than the requested one. */
function alternativeDesigns(request: PlanRequest, requested: number[]): [MethodId, number[]][] {
	const d = request.dimension;
	const out: [MethodId, number[]][] = [];
	for (const method of METHOD_IDS) {
		for (const bases of [[0, 1], availableBases(d)]) {
			if (method === request.method && bases.join() === requested.join()) continue;
			if (out.some(([m, b]) => m === method && b.join() === bases.join())) continue;
			try {
				witnessFamilies[method].checkBases(bases, d);
				out.push([method, bases]);
			} catch {
				// This method does not take this basis set.
			}
		}
	}
	return out;
}

/** Throws an InputError naming the field that cannot be planned. */
export function checkPlanRequest(request: PlanRequest): void {
	const { method, dimension: d, schmidtNumber: k, visibility } = request;
	if (!METHOD_IDS.includes(method))
		throw new InputError(`method must be one of ${METHOD_IDS.join(', ')}, got '${method}'`);
	checkDimension(d);
	if (!Number.isInteger(k) || k < 2 || k > d)
		throw new InputError(
			`schmidtNumber must be a whole number from 2 to the dimension ${d}, got ${k}`
		);
	if (!(visibility >= 0 && visibility <= 1))
		throw new InputError(`visibility must lie from 0 to 1, got ${visibility}`);
	const c = request.confidence;
	if (c !== undefined && !(c > CONFIDENCE.above && c < CONFIDENCE.below))
		throw new InputError(
			`confidence must lie strictly between ${CONFIDENCE.above} and ${CONFIDENCE.below}, got ${c}`
		);
}

export function planExperiment(request: PlanRequest): ExperimentPlan {
	checkPlanRequest(request);
	const { method, dimension: d, schmidtNumber: k, visibility } = request;
	const bases = resolveBases(method, d, request.bases);
	const family = witnessFamilies[method];
	const scale = noiseScale(family, d, bases);
	const simulate = request.simulate ?? 'requested';
	const confidence = request.confidence ?? DEFAULTS.confidence;
	return {
		request: { method, dimension: d, schmidtNumber: k, visibility, confidence, bases },
		rungs: family.bounds(d, bases).map((bound, i) => ({
			upToSchmidtNumber: i + 1,
			bound,
			criticalVisibility: visibilityOf(bound, scale)
		})),
		design: planDesign(method, bases, request, simulate !== 'none'),
		alternatives: alternativeDesigns(request, bases).map(([m, b]) =>
			planDesign(m, b, request, simulate === 'all')
		),
		curve: visibilityCurve(method, k, request.bases === 'all' ? 'all' : bases),
		simulation: {
			...(request.settings ?? POWER_SIMULATION),
			target: POWER_SIMULATION.target,
			engine: 'certify'
		}
	};
}
