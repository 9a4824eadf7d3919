import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { app } from '$lib/server/app/app';
import { isStopping } from '$lib/server/app/signals';
import { ANONYMOUS } from '$lib/server/core/actor';
import { runAs } from '$lib/server/core/acting';
import { reviewLink } from '$lib/server/http/review-handle';
import { originCheck, rejectControlCharacters } from '$lib/server/http/request-guards';
import { securityHeaders } from '$lib/server/http/response-headers';
import { authenticate } from '$lib/server/accounts/tokens';

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

/** Last: the rest of the request runs as its caller, so audit rows say how the caller acted. */
const acting: Handle = ({ event, resolve }) => runAs(event.locals.actor, () => resolve(event));

/** Start the database, mail, check runner (and demo) with the server, not on the first request. */
export const init: ServerInit = async () => {
	await app();
};

/** A body over BODY_SIZE_LIMIT (form posts meet it) in our words; anything else is logged. */
export const handleError: HandleServerError = ({ error, status, message }) => {
	if (status === 413)
		return {
			code: 'too_large',
			message: 'What was sent is larger than this server accepts; nothing of it was kept.'
		};
	if (status !== 404) console.error(error);
	return { message };
};

export const handle: Handle = sequence(
	securityHeaders,
	draining,
	originCheck,
	rejectControlCharacters,
	session,
	bearer,
	reviewLink,
	acting
);
