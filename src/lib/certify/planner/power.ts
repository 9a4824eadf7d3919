/**
 * Power of the engine's own bound, by simulating the engine (docs/statistics.md §8): draw
 * Poisson tables from a model at a number of counts, run the very check a group would run, and
 * count how often it certifies. No normal approximation: the answer is the engine's.
 */
import type { CertifyOptions } from '../plan';
import { InputError, type CountsDataset } from '../counts';
import type { MethodId } from '../witnesses';
import { PoissonSampler, prepareMeans } from '../poisson';

/** The settings of a simulated power run; part of every answer so that it can be re-run. */
export const POWER_SIMULATION = {
	/** Experiments per count level: the standard error of a 90 % estimate is then 2.1 %. */
	experiments: 200,
	/** Resamples of each simulated check (the engine's bound at fewer draws; see statistics.md). */
	resamples: 2000,
	seed: 1,
	target: 0.9
} as const;

/** The engine as the simulation needs it (certify.ts, passed in: importing it would be a cycle). */
export type Engine = (
	dataset: CountsDataset,
	options: CertifyOptions
) => { certifiedSchmidtNumber: number };

/** A measurement design and a model of the state: what is simulated. */
export interface PowerDesign {
	/** A witness family, or fidelity-target (its engine then carries λ). */
	method: MethodId | 'fidelity-target';
	dimension: number;
	bases: number[];
	confidence: number;
	/** Exact outcome probabilities p_t(a, b) per basis, cell a·d + b, in `bases` order. */
	model: Float64Array[];
	/** Relative counts per basis (all 1: equal totals; a finished check: its own totals). */
	weights: number[];
	schmidtNumber: number;
}

export interface SimulationSettings {
	experiments: number;
	resamples: number;
	seed: number;
}

function sampleDataset(design: PowerDesign, scale: number, seed: number): CountsDataset {
	const sampler = new PoissonSampler(seed);
	const cells = design.dimension * design.dimension;
	return {
		dimension: design.dimension,
		tables: design.bases.map((basis, i) => {
			const counts = new Float64Array(cells);
			const w = scale * design.weights[i];
			sampler.drawAll(prepareMeans(design.model[i].map((p) => p * w)), counts);
			return {
				basis,
				counts,
				accidentals: null,
				durations: null,
				present: new Uint8Array(cells).fill(1)
			};
		})
	};
}

/** One simulated check; data the engine refuses (a basis with no counts at all) certify nothing. */
function certifies(
	engine: Engine,
	design: PowerDesign,
	dataset: CountsDataset,
	settings: SimulationSettings,
	seed: number
): boolean {
	try {
		const result = engine(dataset, {
			method: design.method,
			bases: design.bases,
			confidence: design.confidence,
			resamples: settings.resamples,
			seed
		});
		return result.certifiedSchmidtNumber >= design.schmidtNumber;
	} catch (error) {
		if (error instanceof InputError) return false;
		throw error;
	}
}

/**
 * The fraction of simulated experiments at `scale` (counts per unit weight) that certify k. With
 * `decide`, stops as soon as the full run's answer to "power ≥ decide?" is known (same answer,
 * fewer checks); the fraction returned is then that of the experiments run.
 */
export function simulatedPower(
	engine: Engine,
	design: PowerDesign,
	scale: number,
	settings: SimulationSettings,
	decide?: number
): number {
	const n = settings.experiments;
	const needed = decide === undefined ? n + 1 : Math.ceil(decide * n);
	let [certified, done] = [0, 0];
	const open = () => decide === undefined || (certified < needed && done - certified <= n - needed);
	while (done < n && open()) {
		// Experiment i uses the same seeds at every scale (common random numbers).
		const seed = settings.seed + 2 * done;
		done++;
		if (certifies(engine, design, sampleDataset(design, scale, seed), settings, seed + 1))
			certified++;
	}
	return certified / done;
}

export interface CountsForPower {
	/** Counts per unit weight (counts per basis for equal weights) at which the power was reached. */
	scale: number;
	power: number;
	/** Every level simulated, in order, and whether its power reached the target. */
	levels: { scale: number; reached: boolean }[];
}

/** Brackets grow or shrink by 1.5; the answer is then refined to within 10 %. */
const [BRACKET, STEP] = [1.5, 1.1];

/**
 * The smallest simulated level (within 10 %) whose power reaches the target, or null when none up
 * to `ceiling` does. Brackets geometrically from `start`, then bisects on a log scale.
 */
export function countsForPower(
	engine: Engine,
	design: PowerDesign,
	start: number,
	ceiling: number,
	settings: SimulationSettings,
	target: number = POWER_SIMULATION.target
): CountsForPower | null {
	const levels: { scale: number; reached: boolean }[] = [];
	// Each level only decides reached / not reached; the answer's own power is then run in full.
	const at = (scale: number) => {
		const power = simulatedPower(engine, design, scale, settings, target);
		levels.push({ scale, reached: power >= target });
		return power;
	};
	const full = (scale: number) => ({
		scale,
		power: simulatedPower(engine, design, scale, settings),
		levels
	});
	let high = Math.min(ceiling, Math.max(1, Math.round(start)));
	let highPower = at(high);
	let low = high;
	if (highPower >= target) {
		// Shrink until a level falls short (or one count is enough).
		while (low > 1) {
			low = Math.max(1, Math.floor(low / BRACKET));
			const power = at(low);
			if (power < target) break;
			[high, highPower] = [low, power];
		}
		if (high === 1) return full(1);
	} else {
		while (highPower < target) {
			if (high >= ceiling) return null;
			low = high;
			high = Math.min(ceiling, Math.ceil(high * BRACKET));
			highPower = at(high);
		}
	}
	while (high / low > STEP && high - low > 1) {
		const mid = Math.round(Math.sqrt(low * high));
		const power = at(mid);
		if (power >= target) [high, highPower] = [mid, power];
		else low = mid;
	}
	return full(high);
}
