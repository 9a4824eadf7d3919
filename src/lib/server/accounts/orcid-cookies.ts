/**
 * The two short-lived cookies of ORCID sign-in: the started sign-in's handle (state, nonce and
 * PKCE verifier stay on the server) and the handle of an iD waiting to be linked. HttpOnly,
 * SameSite=Lax (the provider's redirect back is a top-level GET), scoped to /login/orcid.
 */
import type { Cookies } from '@sveltejs/kit';
import { config } from '../core/config';
import { ATTEMPT_SECONDS, PENDING_SECONDS } from './orcid-attempts';

export const ATTEMPT_COOKIE = 'rankseal_orcid';
export const PENDING_COOKIE = 'rankseal_orcid_link';

const options = (maxAge: number) => ({
	path: '/login/orcid',
	httpOnly: true,
	sameSite: 'lax' as const,
	secure: config().origin.startsWith('https:'),
	maxAge
});

export const keepAttemptCookie = (cookies: Cookies, handle: string) =>
	cookies.set(ATTEMPT_COOKIE, handle, options(ATTEMPT_SECONDS));

export const keepPendingCookie = (cookies: Cookies, handle: string) =>
	cookies.set(PENDING_COOKIE, handle, options(PENDING_SECONDS));

export const dropOrcidCookie = (cookies: Cookies, name: string) =>
	cookies.delete(name, { path: '/login/orcid', secure: config().origin.startsWith('https:') });
