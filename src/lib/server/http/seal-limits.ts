/**
 * The public /seal pages ask no account, so their limits are per client address: checking a
 * bundle costs a worker thread for seconds, a look-up a database read. Over a limit the answer is
 * 429 with Retry-After and the words every limit uses.
 */
import { error, type RequestEvent } from '@sveltejs/kit';
import { takeOrRefuse } from '../core/rate-limits';
import { RateLimitedError } from '../core/errors';

type SealEvent = Pick<RequestEvent, 'getClientAddress' | 'setHeaders'>;

const WORDS = {
	sealBundle: 'Too many bundle checks from your network address.',
	sealLookup: 'Too many certificate look-ups from your network address.'
} as const;

/** Counts one use; the refusal (with Retry-After already set on the answer) when over the limit. */
export async function sealRefusal(
	event: SealEvent,
	use: keyof typeof WORDS
): Promise<RateLimitedError | null> {
	try {
		await takeOrRefuse(use, event.getClientAddress(), WORDS[use]);
		return null;
	} catch (problem) {
		if (!(problem instanceof RateLimitedError)) throw problem;
		event.setHeaders({ 'retry-after': String(problem.retryAfterSeconds ?? 1) });
		return problem;
	}
}

/** For a page load: counts a look-up, or answers 429 (Kit's error page, Retry-After set). */
export async function countSealLookup(event: SealEvent): Promise<void> {
	const refusal = await sealRefusal(event, 'sealLookup');
	if (refusal) error(429, { message: refusal.message, code: 'rate_limited' });
}
