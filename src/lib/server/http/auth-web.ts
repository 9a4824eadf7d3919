/** Small helpers shared by the pages: the signed-in caller, session cookies, safe ?next= paths. */
import { redirect, type Cookies } from '@sveltejs/kit';
import type { UserActor } from '../core/actor';
import type { AppLucia } from '../accounts/auth';

const HOME = 'http://rankseal.invalid';

/**
 * A same-origin path to go to after signing in; anything else becomes the fallback. The check
 * runs on the normalised URL: `/.//evil.example` normalises to `//evil.example`, which a browser
 * reads as another host.
 */
export function safeNext(next: string | null | undefined, fallback = '/claims'): string {
	if (!next || !next.startsWith('/')) return fallback;
	// Control characters and backslashes could be read as another origin by some browsers.
	if (/[\u0000-\u001f\u007f\\]/.test(next)) return fallback;
	let parsed: URL;
	try {
		parsed = new URL(next, HOME);
	} catch {
		return fallback;
	}
	const path = parsed.pathname + parsed.search + parsed.hash;
	if (parsed.origin !== HOME || !path.startsWith('/') || path.startsWith('//')) return fallback;
	return path;
}

export const loginPath = (url: URL): string =>
	`/login?next=${encodeURIComponent(url.pathname + url.search)}`;

/** The signed-in caller, or a 303 to the sign-in page that comes back here afterwards. */
export function requireSignedIn(locals: App.Locals, url: URL): UserActor {
	if (locals.actor.kind !== 'user') redirect(303, loginPath(url));
	return locals.actor;
}

export async function startSession(
	lucia: AppLucia,
	cookies: Cookies,
	userId: string
): Promise<void> {
	const session = await lucia.createSession(userId, {});
	const cookie = lucia.createSessionCookie(session.id);
	cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
}

export function clearSessionCookie(lucia: AppLucia, cookies: Cookies): void {
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

/** Text fields of a form to send back after a failed submit; passwords are never included. */
export function echoValues(form: FormData, keys: string[]): Record<string, string> {
	const values: Record<string, string> = {};
	for (const key of keys) {
		const value = form.get(key);
		if (typeof value === 'string' && !/password/i.test(key)) values[key] = value;
	}
	return values;
}
