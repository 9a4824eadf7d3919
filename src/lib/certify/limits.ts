/**
 * The limits of a check, exported once: the engine enforces them, and the zod schema, the forms
 * and the API description import them from here.
 */
export const RESAMPLES = { min: 100, max: 1_000_000, default: 10_000 } as const;

/** One-sided confidence, strictly between the two ends; the default is 3σ (Φ(3) ≈ 0.99865). */
export const CONFIDENCE = { above: 0.5, below: 1, default: 0.99865 } as const;

/** The landing page's in-browser example stays below this many resamples. */
export const BROWSER_RESAMPLES_MAX = 200_000;
