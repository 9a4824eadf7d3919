/**
 * One use of a review link under the limits (rate-limits.ts): links that do not open count per
 * client address (guessing tokens, with growing pauses), and every link has a ceiling of uses.
 */
import type { RefereeActor } from '../core/actor';
import type { Database } from '../db';
import { rateLimits, retryWords } from '../core/rate-limits';
import { RateLimitedError } from '../core/errors';
import { resolveReviewToken } from './review-links';

/** The referee, null for a link that does not open, or the refusal when a limit is reached. */
export async function refereeFor(
	database: Database,
	token: string,
	use: { method: string; path: string },
	client: { address: string }
): Promise<RefereeActor | null | RateLimitedError> {
	const { reviewRefused, reviewUse } = rateLimits();
	const refused = await reviewRefused.check(client.address);
	if (refused !== null) {
		const words = `Too many review links that do not open, from your network address. Try again ${retryWords(refused)}.`;
		return new RateLimitedError(words, refused);
	}
	const referee = await resolveReviewToken(database, token, use);
	if (!referee) {
		await reviewRefused.fail(client.address);
		return null;
	}
	const busy = await reviewUse.take(referee.linkId);
	if (busy === null) return referee;
	const words = `This review link has been used very often in a short time. Try again ${retryWords(busy)}.`;
	return new RateLimitedError(words, busy);
}
