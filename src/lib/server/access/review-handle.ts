/**
 * Resolves a review link in the path (/review/{token}… and /api/v1/review/{token}…) into the
 * referee caller. The link is the whole caller there: a session cookie that comes along is ignored.
 * Uses are limited (rate-limits.ts): per link, and per client address for links that do not open
 * (guessing). The API answers 429 here; a page gets locals.refusal and its load answers 429.
 */
import type { Handle } from '@sveltejs/kit';
import { app } from '../app';
import { problemResponse, problemOf } from '../problems';
import { rateLimits, retryWords } from '../rate-limits';
import { RateLimitedError } from '../services/errors';
import { resolveReviewToken } from '../services/review-links';
import { ANONYMOUS, type RefereeActor } from './actor';

const REVIEW_PATH = /^\/(?:api\/v1\/)?review\/([^/]+)/;

/** The referee, null for a link that does not open, or the refusal when a limit is reached. */
async function refereeFor(
	token: string,
	use: { method: string; path: string },
	client: string
): Promise<RefereeActor | null | RateLimitedError> {
	const { reviewRefused, reviewUse } = rateLimits();
	const refused = await reviewRefused.check(client);
	if (refused !== null) {
		const words = `Too many review links that do not open, from your network address. Try again ${retryWords(refused)}.`;
		return new RateLimitedError(words, refused);
	}
	const { database } = await app();
	const referee = await resolveReviewToken(database, token, use);
	if (!referee) {
		await reviewRefused.fail(client);
		return null;
	}
	const busy = await reviewUse.take(referee.linkId);
	if (busy === null) return referee;
	const words = `This review link has been used very often in a short time. Try again ${retryWords(busy)}.`;
	return new RateLimitedError(words, busy);
}

export const reviewLink: Handle = async ({ event, resolve }) => {
	const token = REVIEW_PATH.exec(event.url.pathname)?.[1];
	if (token === undefined) return resolve(event);
	const use = { method: event.request.method, path: event.url.pathname };
	const found = await refereeFor(token, use, event.getClientAddress());
	event.locals.user = null;
	event.locals.session = null;
	if (!(found instanceof RateLimitedError)) {
		event.locals.actor = found ?? ANONYMOUS;
		return resolve(event);
	}
	if (event.url.pathname.startsWith('/api/')) return problemResponse(problemOf(found)!);
	event.locals.actor = ANONYMOUS;
	event.locals.refusal = found;
	const response = await resolve(event);
	response.headers.set('retry-after', String(found.retryAfterSeconds ?? 1));
	return response;
};
