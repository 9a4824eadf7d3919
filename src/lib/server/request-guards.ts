/**
 * Refuses requests whose path, query or cookies carry control characters (NUL, CR, …): no id,
 * search or session id contains them, and SQLite and the session store must never see them.
 */
import { error, type Handle } from '@sveltejs/kit';
import { problemResponse } from './problems';

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
		if (hasControlCharacters(value)) event.cookies.delete(name, { path: '/' });
	return resolve(event);
};
