/**
 * The planner's question for fidelity-target (planner/plan-target.ts) as the API and `npm run plan`
 * take it: the declared λ as `target` (comma-separated), no bases (always the computational and
 * tilted tables), no dimension (it is λ's length).
 */
import { z } from 'zod';
import { CONFIDENCE } from '../limits';
import type { TargetPlanRequest } from './plan-target';

const targetList = z
	.string({ error: 'give the declared target λ as numbers such as 0.86,0.49,0.14' })
	.trim()
	.regex(
		/^[0-9.eE+-]+(,[0-9.eE+-]+)+$/,
		'give the declared target λ as numbers such as 0.86,0.49,0.14'
	)
	.transform((text) => text.split(',').map(Number));

export const targetPlanQuery = z
	.object({
		method: z.literal('fidelity-target'),
		target: targetList,
		dimension: z.coerce.number().int().optional(),
		schmidtNumber: z.coerce.number().int().min(2),
		visibility: z.coerce.number().min(0).max(1),
		confidence: z.coerce.number().gt(CONFIDENCE.above).lt(CONFIDENCE.below).optional()
	})
	.refine((q) => q.dimension === undefined || q.dimension === q.target.length, {
		message: 'must equal the number of Schmidt coefficients in target',
		path: ['dimension']
	})
	.refine((q) => q.schmidtNumber <= q.target.length, {
		message: 'must not exceed the dimension (the number of coefficients in target)',
		path: ['schmidtNumber']
	});

/** Strings (query parameters or command-line options) to a request; empty strings count as absent. */
export function parseTargetPlanQuery(
	values: Record<string, string | undefined>
): TargetPlanRequest {
	const present = Object.fromEntries(
		Object.entries(values).filter(([, v]) => v !== undefined && v !== '')
	);
	const q = targetPlanQuery.parse(present);
	return {
		target: q.target,
		schmidtNumber: q.schmidtNumber,
		visibility: q.visibility,
		confidence: q.confidence
	};
}
