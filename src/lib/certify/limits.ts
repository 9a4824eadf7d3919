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
 * Cells read × resamples a check may ask for: the work grows with both, so a big table gets
 * fewer resamples (d = 64 on two bases: 244 140). Even d = 256 on all 257 bases keeps ≥ 100.
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
