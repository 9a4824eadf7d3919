/** A service error during a page load, as Kit's error page; a 429 carries Retry-After. */
import type { RequestEvent } from '@sveltejs/kit';
import { pageProblem, problemOf } from '../problems';

export function pageRefused(event: Pick<RequestEvent, 'setHeaders'>, problem: unknown): never {
	const known = problemOf(problem);
	if (known?.status === 429)
		event.setHeaders({ 'retry-after': String(known.retryAfterSeconds ?? 1) });
	pageProblem(problem);
}
