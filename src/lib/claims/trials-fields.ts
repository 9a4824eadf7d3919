/** A claim's time-ordered trials: the mode, the setting probabilities and the rules between them. */
import { z } from 'zod';

/** Forms: "0.5, 0.5"; JSON: [0.5, 0.5]. Empty → undefined (uniform). */
export const probabilitiesField = z.preprocess(
	(value) => {
		if (typeof value === 'string') value = value.split(/[\s,]+/).filter((part) => part !== '');
		if (Array.isArray(value)) return value.length ? value.map((v) => Number(v)) : undefined;
		// null: what a validated claim carries for "uniform", so it parses again unchanged.
		return value ?? undefined;
	},
	z
		.array(
			z
				.number({ error: 'Each setting probability must be a number.' })
				.gt(0, 'Each setting probability must lie above 0.')
				.max(1, 'Each setting probability must be at most 1.'),
			{ error: 'Setting probabilities must be a list of numbers.' }
		)
		.optional()
);

/** Time-ordered trials: one bet per coincidence, or one per block of one setting. */
export const TRIALS_MODES = ['trials', 'blocks'] as const;
const TRIALS_METHODS: readonly string[] = ['mub-correlation', 'steering-2mub'];

/** Probabilities need a trials mode, one per basis, summing to 1; the mode needs a sum method. */
export function trialsProblem(
	claim: {
		trialsMode?: string | null;
		trialsProbabilities?: number[];
		method: string;
		bases?: number[];
	},
	ctx: z.RefinementCtx
) {
	const issue = (path: string, message: string) =>
		ctx.addIssue({ code: 'custom', path: [path], message });
	const pi = claim.trialsProbabilities;
	if (!claim.trialsMode) {
		if (pi)
			issue('trialsProbabilities', 'Setting probabilities need a trials mode (trials or blocks).');
		return;
	}
	if (!TRIALS_METHODS.includes(claim.method))
		issue('method', `Time-ordered trials work with ${TRIALS_METHODS.join(' or ')}.`);
	if (!pi) return;
	if (claim.bases && pi.length !== claim.bases.length)
		issue('trialsProbabilities', `Give one setting probability per basis (${claim.bases.length}).`);
	const sum = pi.reduce((s, p) => s + p, 0);
	if (Math.abs(sum - 1) > 1e-9)
		issue('trialsProbabilities', `The setting probabilities must sum to 1 (they sum to ${sum}).`);
}
