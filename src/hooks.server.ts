import type { Handle, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { app, isStopping } from '$lib/server/app';
import { formOriginCheck } from '$lib/server/api';
import { ANONYMOUS } from '$lib/server/access/actor';
import { reviewLink } from '$lib/server/access/review-handle';
import { rejectControlCharacters } from '$lib/server/request-guards';
import { authenticate } from '$lib/server/services/tokens';

/**
 * Reads the session cookie, renews it when lucia says so, and resolves the caller: locals.actor,
 * with locals.user / locals.session kept for the pages' display and for signing out.
 */
const session: Handle = async ({ event, resolve }) => {
	const { lucia } = await app();
	const sessionId = event.cookies.get(lucia.sessionCookieName);
	event.locals.user = null;
	event.locals.session = null;
	event.locals.actor = ANONYMOUS;
	if (sessionId) {
		const { session, user } = await lucia.validateSession(sessionId);
		if (session?.fresh) {
			const cookie = lucia.createSessionCookie(session.id);
			event.cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
		}
		if (!session) {
			const blank = lucia.createBlankSessionCookie();
			event.cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
		}
		event.locals.user = user;
		event.locals.session = session;
		if (user) {
			const { id: userId, accountRole, emailVerified } = user;
			event.locals.actor = { kind: 'user', userId, accountRole, emailVerified };
		}
	}
	return resolve(event);
};

/**
 * For /api/ requests with `Authorization: Bearer <token>`: the token as the caller, or nobody for
 * an unknown, expired or revoked token (refused even when a session cookie comes along).
 */
const bearer: Handle = async ({ event, resolve }) => {
	const header = event.request.headers.get('authorization');
	const token = header?.match(/^Bearer\s+(\S+)\s*$/i)?.[1];
	if (event.url.pathname.startsWith('/api/') && header) {
		const { database } = await app();
		event.locals.actor = (token && (await authenticate(database, token))) || ANONYMOUS;
		event.locals.user = null;
		event.locals.session = null;
	}
	return resolve(event);
};

/** From SIGTERM/SIGINT on, a request that still reaches the draining server is turned away. */
const draining: Handle = async ({ event, resolve }) => {
	if (!isStopping()) return resolve(event);
	const message = 'Rankseal is stopping for a moment; try again shortly.';
	const headers = { 'retry-after': '10', connection: 'close' };
	if (!event.url.pathname.startsWith('/api/'))
		return new Response(message, { status: 503, headers });
	return Response.json({ error: { code: 'unavailable', message } }, { status: 503, headers });
};

/** Start the database, mail, check runner (and demo) with the server, not on the first request. */
export const init: ServerInit = async () => {
	await app();
};

export const handle: Handle = sequence(
	draining,
	formOriginCheck,
	rejectControlCharacters,
	session,
	bearer,
	reviewLink
);
