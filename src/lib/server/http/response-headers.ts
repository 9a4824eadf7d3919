/**
 * Headers on every answer Kit makes (the Content-Security-Policy itself is Kit's, from
 * svelte.config.js): no type sniffing, no framing, a referrer policy, and no caching of anything
 * private. Files under /_app and static/ are served by adapter-node before any hook runs: they get
 * the same headers from scripts/server.mjs.
 */
import { isHttpError, text, type Handle, type RequestEvent } from '@sveltejs/kit';
import { SECRET_IN_PATH, securityHeadersFor } from './security-headers.js';

/** Whether this answer may hold something private: a caller's own data or a secret in the URL. */
function isPrivate(event: RequestEvent): boolean {
	const actor = event.locals.actor;
	if (actor && actor.kind !== 'anonymous') return true;
	// A session cookie that did not resolve still marks a browser that was signed in.
	return SECRET_IN_PATH.test(event.url.pathname) || event.request.headers.has('cookie');
}

function decorate(event: RequestEvent, response: Response): Response {
	const headers = response.headers;
	for (const [name, value] of Object.entries(securityHeadersFor(event.url.pathname)))
		headers.set(name, value);
	if (isPrivate(event)) headers.set('cache-control', 'no-store');
	return response;
}

/**
 * Put first in the hooks' sequence. A refusal thrown by a later handle (not by a page) would
 * get Kit's bare static page without these headers, so it is answered here as plain text.
 */
export const securityHeaders: Handle = async ({ event, resolve }) => {
	let response: Response;
	try {
		response = await resolve(event);
	} catch (error) {
		if (!isHttpError(error)) throw error;
		response = text(error.body.message, { status: error.status });
	}
	try {
		return decorate(event, response);
	} catch {
		// Some responses (a fetched one passed through) have immutable headers: copy them first.
		return decorate(event, new Response(response.body, response));
	}
};
