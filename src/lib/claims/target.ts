/**
 * A `fidelity-target` claim's declared target Φ_λ = Σ_m λ_m |mm⟩ (witnesses.md §4.3′): d Schmidt
 * coefficients, positive, not increasing, Σλ² = 1 (declared before the data, never fitted on them).
 */
import { z } from 'zod';
import type { MethodId } from '$lib/certify';

export const TARGET_METHOD = 'fidelity-target' as const;
/** What a claim's method may be: a bootstrap witness family or the declared-target check. */
export type ClaimMethod = MethodId | typeof TARGET_METHOD;
/** Where λ comes from: declared with the claim, or fitted on a separate calibration run (§9). */
export const TARGET_SOURCES = ['declared', 'calibration-run'] as const;
export type TargetSource = (typeof TARGET_SOURCES)[number];
/** The claim page's and the API's name for the calibration run file (the field refusals name). */
export const TARGET_RUN_FIELD = 'targetRun';

/** Forms and JSON: "declared" (the default) or "calibration-run". Empty → undefined. */
export const targetFromField = z.preprocess(
	(value) => (value === '' || value === null ? undefined : value),
	z
		.enum(TARGET_SOURCES, { error: 'Where λ comes from must be declared or calibration-run.' })
		.optional()
);

/** How far Σλ² may stray from 1 before the service scales λ itself (and the result says so). */
export const TARGET_NORM_TOLERANCE = 1e-6;

/** Forms: "0.8, 0.5, 0.33"; JSON: [0.8, 0.5, 0.33]. Empty → undefined. */
export const targetField = z.preprocess(
	(value) => {
		if (value === null) return undefined;
		if (typeof value === 'string') value = value.split(/[\s,]+/).filter((part) => part !== '');
		if (Array.isArray(value)) return value.length ? value.map((v) => Number(v)) : undefined;
		return value;
	},
	z
		.array(
			z
				.number({ error: 'Each Schmidt coefficient of the target must be a number.' })
				.finite('Each Schmidt coefficient of the target must be a finite number.')
				.gt(0, 'Each Schmidt coefficient of the target must lie above 0.'),
			{ error: 'The target must be a list of Schmidt coefficients.' }
		)
		.optional()
);

/** Σλ² of the declared coefficients. */
export const targetNorm = (lambda: number[]) => lambda.reduce((s, x) => s + x * x, 0);

/** λ scaled to Σλ² = 1 when it strays more than the tolerance; otherwise as declared. */
export function normalisedTarget(lambda: number[]): { target: number[]; scaled: boolean } {
	const norm = targetNorm(lambda);
	if (Math.abs(norm - 1) <= TARGET_NORM_TOLERANCE) return { target: lambda, scaled: false };
	return { target: lambda.map((x) => x / Math.sqrt(norm)), scaled: true };
}

/** A declared λ kept beside the stored one only if it scales to it (a re-parsed claim keeps it). */
export function declaredOf(target: number[], declared: number[] | undefined): number[] | null {
	if (!declared || declared.length !== target.length) return null;
	const { target: scaled } = normalisedTarget(declared);
	const same = scaled.every((x, i) => Math.abs(x - target[i]) <= TARGET_NORM_TOLERANCE);
	return same ? declared : null;
}

/**
 * The target is required by, and only by, `fidelity-target`: d coefficients, not increasing; or,
 * with `targetFrom: 'calibration-run'`, none (the run, uploaded before the first check, fits it).
 */
export function targetProblem(
	claim: { method: string; dimension: number; target?: number[] | null; targetFrom?: TargetSource },
	ctx: z.RefinementCtx
): void {
	const issue = (message: string) => ctx.addIssue({ code: 'custom', path: ['target'], message });
	const lambda = claim.target;
	const fromRun = claim.targetFrom === 'calibration-run';
	if (claim.method !== TARGET_METHOD) {
		if (lambda) issue('Only the fidelity-target method takes a target.');
		if (fromRun)
			ctx.addIssue({
				code: 'custom',
				path: ['targetFrom'],
				message: 'Only the fidelity-target method takes λ from a calibration run.'
			});
		return;
	}
	if (fromRun) {
		if (lambda)
			issue('Give λ or take it from a calibration run, not both: leave the target empty.');
		return;
	}
	if (!lambda) return issue('Declare the target’s Schmidt coefficients λ (d numbers).');
	if (lambda.length !== claim.dimension)
		return issue(
			`Give ${claim.dimension} Schmidt coefficients (one per level), not ${lambda.length}.`
		);
	const rise = lambda.findIndex((x, i) => i > 0 && x > lambda[i - 1]);
	if (rise > 0)
		issue(`The Schmidt coefficients must not increase (${lambda[rise - 1]} then ${lambda[rise]}).`);
}
