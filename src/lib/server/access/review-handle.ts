/**
 * Resolves a review link in the path (/review/{token}… and /api/v1/review/{token}…) into the
 * referee caller. The link is the whole caller there: a session cookie that comes along is ignored.
 */
import type { Handle } from '@sveltejs/kit';
import { app } from '../app';
import { resolveReviewToken } from '../services/review-links';
import { ANONYMOUS } from './actor';

const REVIEW_PATH = /^\/(?:api\/v1\/)?review\/([^/]+)/;

export const reviewLink: Handle = async ({ event, resolve }) => {
	const token = REVIEW_PATH.exec(event.url.pathname)?.[1];
	if (token !== undefined) {
		const { database } = await app();
		const use = { method: event.request.method, path: event.url.pathname };
		event.locals.actor = (await resolveReviewToken(database, token, use)) ?? ANONYMOUS;
		event.locals.user = null;
		event.locals.session = null;
	}
	return resolve(event);
};
