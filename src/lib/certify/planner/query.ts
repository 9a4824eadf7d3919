/**
 * The planner's questions as the page, the API (`GET /api/v1/plan`) and `npm run plan` take them:
 * one schema for all three, so that a field is named the same way everywhere.
 */
import { z } from 'zod';
import { MAX_DIMENSION, MIN_DIMENSION } from '../bases';
import { CONFIDENCE } from '../limits';
import { METHOD_IDS, type MethodId } from '../witnesses';
import type { PlanRequest } from './plan-experiment';

export const SIMULATE_CHOICES = ['requested', 'all', 'none'] as const;

/** fidelity-target needs its declared λ: the API (`target=`) and `npm run plan -- --target` take it. */
export const PLANNER_TARGET_REFUSAL =
	'the planner page does not cover fidelity-target: its power depends on the declared λ, which this form does not take; GET /api/v1/plan?method=fidelity-target&target=… and npm run plan -- --method fidelity-target --target … plan it';

const plannerMethod = z
	.string()
	.refine((v) => v !== 'fidelity-target', { message: PLANNER_TARGET_REFUSAL, abort: true })
	.pipe(z.enum(METHOD_IDS as [MethodId, ...MethodId[]]));

export const planQuery = z
	.object({
		method: plannerMethod,
		dimension: z.coerce.number().int().min(MIN_DIMENSION).max(MAX_DIMENSION),
		schmidtNumber: z.coerce.number().int().min(2),
		visibility: z.coerce.number().min(0).max(1),
		bases: z
			.string()
			.trim()
			.regex(/^(all|\d+(,\d+)*)$/, 'give basis indices such as 0,1 or the word all')
			.optional(),
		confidence: z.coerce.number().gt(CONFIDENCE.above).lt(CONFIDENCE.below).optional(),
		simulate: z.enum(SIMULATE_CHOICES).default('requested')
	})
	.refine((q) => q.schmidtNumber <= q.dimension, {
		message: 'must not exceed the dimension',
		path: ['schmidtNumber']
	});

export type PlanQuery = z.infer<typeof planQuery>;

/** Strings (query parameters or command-line options) to a request; empty strings count as absent. */
export function parsePlanQuery(values: Record<string, string | undefined>): PlanRequest {
	const present = Object.fromEntries(
		Object.entries(values).filter(([, v]) => v !== undefined && v !== '')
	);
	const q = planQuery.parse(present);
	return {
		method: q.method,
		dimension: q.dimension,
		schmidtNumber: q.schmidtNumber,
		visibility: q.visibility,
		bases: q.bases === undefined || q.bases === 'all' ? q.bases : q.bases.split(',').map(Number),
		confidence: q.confidence,
		simulate: q.simulate
	};
}
