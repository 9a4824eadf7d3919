/**
 * The limits of a check, exported once: the engine enforces them, and the zod schema, the forms
 * and the API description import them from here.
 */
export const RESAMPLES = { min: 100, max: 1_000_000, default: 10_000 } as const;

/** One-sided confidence, strictly between the two ends; the default is 3σ (Φ(3) ≈ 0.99865). */
export const CONFIDENCE = { above: 0.5, below: 1, default: 0.99865 } as const;

/** The landing page's in-browser example stays below this many resamples. */
export const BROWSER_RESAMPLES_MAX = 200_000;

/**
 * Cells read × resamples a per-cell check (rates, subtracted accidentals) may ask for: its work
 * grows with both, so a big table gets fewer resamples (d = 64 on two bases: 244 140). Raw counts
 * have no such ceiling: their bounds draw per basis, not per cell, or do not resample at all.
 */
export const CELL_RESAMPLES_BUDGET = 2_000_000_000;

/** The cells a method reads: d² counts in each of the claim's bases. */
export const cellsRead = (dimension: number, basisCount: number): number =>
	dimension * dimension * basisCount;

/** The most resamples a check of this size may ask for: the absolute ceiling or the budget's. */
export function resamplesCeiling(dimension: number, basisCount: number): number {
	const byBudget = Math.floor(CELL_RESAMPLES_BUDGET / cellsRead(dimension, basisCount));
	return Math.max(RESAMPLES.min, Math.min(RESAMPLES.max, byBudget));
}

/** Why these resamples are too many for this table, or null when they fit. */
export function resamplesProblem(
	resamples: number,
	dimension: number,
	basisCount: number
): string | null {
	const ceiling = resamplesCeiling(dimension, basisCount);
	if (resamples <= ceiling) return null;
	const cells = cellsRead(dimension, basisCount).toLocaleString('en');
	return `resamples must be at most ${ceiling.toLocaleString('en')} for d = ${dimension} on ${basisCount} bases (${cells} cells; cells × resamples ≤ ${CELL_RESAMPLES_BUDGET.toLocaleString('en')})`;
}

/**
 * The fewest resamples whose order statistic keeps the level: ⌈2/q⌉ for a bound at error q
 * (q = α, or α/2 for the fidelity floor), so that the rank ⌊q(B + 1)⌋ is at least 2. Below
 * 1/q the rank would be 0 and the smallest replicate would spend 1/(B + 1) > q.
 */
export function minimumResamples(confidence: number, halfError: boolean): number {
	const q = (1 - confidence) * (halfError ? 0.5 : 1);
	return Math.max(RESAMPLES.min, Math.ceil(2 / q - 1e-9));
}

/** Why these resamples are too few for a bound read off replicates, or null. */
export function tooFewResamplesProblem(
	resamples: number,
	confidence: number,
	halfError: boolean
): string | null {
	const minimum = minimumResamples(confidence, halfError);
	if (resamples >= minimum) return null;
	const error = halfError ? '4/α' : '2/α';
	return `resamples must be at least ${minimum.toLocaleString('en')} at confidence ${confidence} (⌈${error}⌉): this bound is an order statistic of the replicates, and with fewer the smallest replicates would spend more than the error 1 − confidence`;
}
