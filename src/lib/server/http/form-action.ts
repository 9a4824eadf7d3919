/**
 * The one runner of SvelteKit form actions: the action's work runs inside it, and whatever a
 * service throws becomes the same answer beside the form through problems.ts (fail() with the
 * action, the message per field and the values sent back), a 429 always with Retry-After. Kit's
 * own redirect() and error() pass through untouched, so work ends with `redirect(303, …)` or
 * returns the data the page shows once.
 */
import type { ActionFailure, RequestEvent } from '@sveltejs/kit';
import { formFailure, problemOf, retryHeaders, type FormProblem } from './problems';

type HeaderEvent = Pick<RequestEvent, 'setHeaders'>;

/** A refusal beside the form; sets Retry-After on the answer when the refusal is a 429. */
export function formRefused(
	event: HeaderEvent,
	action: string,
	problem: unknown,
	values: Record<string, string> = {}
): ActionFailure<FormProblem> {
	const headers = retryHeaders(problemOf(problem));
	if (headers['retry-after']) event.setHeaders(headers);
	return formFailure(action, problem, values);
}

/**
 * Runs `work` for the form `action`; a service error becomes formRefused() with `values` echoed.
 * `values` may be filled in by the work itself (an upload names its file once it has read it).
 */
export async function runFormAction<T>(
	event: HeaderEvent,
	action: string,
	values: Record<string, string>,
	work: () => Promise<T>
): Promise<T | ActionFailure<FormProblem>> {
	try {
		return await work();
	} catch (problem) {
		return formRefused(event, action, problem, values);
	}
}
