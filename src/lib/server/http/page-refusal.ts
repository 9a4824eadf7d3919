/** A service error during a page load, as Kit's error page; a 429 carries Retry-After. */
import type { RequestEvent } from '@sveltejs/kit';
import { pageProblem, problemOf, retryHeaders } from './problems';

export function pageRefused(event: Pick<RequestEvent, 'setHeaders'>, problem: unknown): never {
	const headers = retryHeaders(problemOf(problem));
	if (headers['retry-after']) event.setHeaders(headers);
	pageProblem(problem);
}
