import { ZodError } from 'zod';
import { fieldErrors, problemOf } from '$lib/server/http/problems';
import { pageRefused } from '$lib/server/http/page-refusal';
import { planFor } from '$lib/server/checks/plans';
import type { PageServerLoad } from './$types';

const FIELDS = [
	'method',
	'dimension',
	'schmidtNumber',
	'visibility',
	'bases',
	'simulate',
	'target'
] as const;

/** fidelity-target takes d from λ's length and always its two tables: the other fields stay aside. */
const asked = (values: Record<string, string | undefined>) =>
	values.method === 'fidelity-target'
		? { ...values, dimension: undefined, bases: undefined, simulate: undefined }
		: { ...values, target: undefined };

/** Public (no sign-in): the planner's form, and its answer once the form has been sent (GET). */
export const load: PageServerLoad = async (event) => {
	const { url, getClientAddress } = event;
	const values = Object.fromEntries(FIELDS.map((f) => [f, url.searchParams.get(f) ?? undefined]));
	if (!url.searchParams.has('method')) return { values, plan: null, errors: {} };
	try {
		return { values, plan: await planFor(asked(values), getClientAddress()), errors: {} };
	} catch (error) {
		if (error instanceof ZodError) return { values, plan: null, errors: fieldErrors(error) };
		const problem = problemOf(error);
		if (!problem) throw error;
		// A refusal to plan now is not a wrong field: the error page, with Retry-After.
		if (problem.status === 429) pageRefused(event, error);
		return { values, plan: null, errors: { [problem.field ?? '']: problem.message } };
	}
};
