/**
 * Handles that refuse a request before anyone reads it: changes sent from another site, and
 * paths, queries or cookies with control characters (no id, search or session id has them).
 */
import { error, type Handle } from '@sveltejs/kit';
import { problemResponse } from './problems';

const UNSAFE_METHODS = ['POST', 'PUT', 'PATCH', 'DELETE'];
/** What an HTML form can send cross-site without a preflight: refused without our Origin. */
const FORM_TYPES = [
	'application/x-www-form-urlencoded',
	'multipart/form-data',
	'text/plain',
	'application/x-sveltekit-formdata'
];

/** Why an unsafe request must be refused as cross-site; null when it may go on. */
function crossSiteProblem(request: Request, url: URL): string | null {
	if (!UNSAFE_METHODS.includes(request.method)) return null;
	const origin = request.headers.get('origin');
	if (origin === url.origin) return null;
	// A browser cannot add this header to a cross-site request, and such calls ignore cookies.
	const bearer = /^Bearer\s/i.test(request.headers.get('authorization') ?? '');
	if (url.pathname.startsWith('/api/') && bearer) return null;
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	if (!request.headers.has('cookie') && !FORM_TYPES.includes(type)) return null;
	const from = origin ? `from ${origin}` : 'without an Origin header';
	return (
		`A ${request.method} ${from} is refused: changes made with a session cookie must come from ` +
		`${url.origin} itself. Scripts send an API token as "Authorization: Bearer rks_…" instead.`
	);
}

/**
 * Cross-site request forgery: every POST, PUT, PATCH or DELETE that carries a cookie or a form
 * body needs our own Origin, whatever its content type; bearer-token API calls are exempt. Kit's
 * own check (form types only) is off: `kit.csrf.trustedOrigins: ['*']` in svelte.config.js.
 */
export const originCheck: Handle = async ({ event, resolve }) => {
	const problem = crossSiteProblem(event.request, event.url);
	if (!problem) return resolve(event);
	if (event.url.pathname.startsWith('/api/'))
		return problemResponse({ status: 403, code: 'forbidden', message: problem });
	error(403, { message: problem, code: 'forbidden' });
};

const CONTROL = /[\u0000-\u001f\u007f]/;

export const hasControlCharacters = (value: string): boolean => CONTROL.test(value);

function decodedPath(pathname: string): string | null {
	try {
		return decodeURIComponent(pathname);
	} catch {
		return null;
	}
}

/** Where the request's URL is unusable, in a few words; null when it is fine. */
function urlProblem(url: URL): string | null {
	const path = decodedPath(url.pathname);
	if (path === null) return 'The address has a malformed %-escape.';
	if (hasControlCharacters(path)) return 'The address contains a control character.';
	for (const [key, value] of url.searchParams)
		if (hasControlCharacters(key) || hasControlCharacters(value))
			return `The query parameter “${key.replace(CONTROL, '?')}” contains a control character.`;
	return null;
}

/**
 * 400 for a URL with control characters (JSON under /api/). A cookie with one cannot be a
 * session of ours: it is dropped for this request and cleared in the browser.
 */
export const rejectControlCharacters: Handle = async ({ event, resolve }) => {
	const problem = urlProblem(event.url);
	if (problem) {
		if (event.url.pathname.startsWith('/api/'))
			return problemResponse({ status: 400, code: 'bad_input', message: problem });
		error(400, { message: problem, code: 'bad_input' });
	}
	for (const { name, value } of event.cookies.getAll())
		if (hasControlCharacters(value))
			event.cookies.delete(name, { path: '/', secure: event.url.protocol === 'https:' });
	return resolve(event);
};
