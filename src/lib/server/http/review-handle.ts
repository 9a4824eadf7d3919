/**
 * Resolves a review link in the path (/review/{token}… and /api/v1/review/{token}…) into the
 * referee caller. The link is the whole caller there: a session cookie that comes along is ignored.
 * Uses are limited (services/review-use.ts): the API answers 429 here; a page gets
 * locals.refusal, its load answers 429, and the answer carries Retry-After.
 */
import type { Handle } from '@sveltejs/kit';
import { app } from '../app/app';
import { problemOf, problemResponse } from './problems';
import { RateLimitedError } from '../core/errors';
import { refereeFor } from '../review/review-use';
import { ANONYMOUS } from '../core/actor';

const REVIEW_PATH = /^\/(?:api\/v1\/)?review\/([^/]+)/;

export const reviewLink: Handle = async ({ event, resolve }) => {
	const token = REVIEW_PATH.exec(event.url.pathname)?.[1];
	if (token === undefined) return resolve(event);
	const { database } = await app();
	const use = { method: event.request.method, path: event.url.pathname };
	const found = await refereeFor(database, token, use, { address: event.getClientAddress() });
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
