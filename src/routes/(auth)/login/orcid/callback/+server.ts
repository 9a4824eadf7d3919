import { error, redirect } from '@sveltejs/kit';
import {
	ATTEMPT_COOKIE,
	dropOrcidCookie,
	keepPendingCookie
} from '$lib/server/accounts/orcid-cookies';
import { finishOrcidSignIn } from '$lib/server/accounts/orcid-sign-in';
import { app } from '$lib/server/app/app';
import { startSession } from '$lib/server/http/auth-web';
import { problemOf } from '$lib/server/http/problems';
import type { RequestHandler } from './$types';

/**
 * Where ORCID sends the browser back. Who is asking: the browser holding the cookie of the
 * sign-in it started (and, for a link from the account page, that very account signed in).
 */
export const GET: RequestHandler = async (event) => {
	const { cookies, url, locals } = event;
	const { database, lucia, orcid } = await app();
	const handle = cookies.get(ATTEMPT_COOKIE);
	dropOrcidCookie(cookies, ATTEMPT_COOKIE);
	let outcome;
	try {
		const request = {
			handle,
			query: url.searchParams,
			actor: locals.actor,
			address: event.getClientAddress()
		};
		outcome = await finishOrcidSignIn(database, orcid, request);
	} catch (problem) {
		const known = problemOf(problem);
		if (!known) throw problem;
		if (known.retryAfterSeconds)
			event.setHeaders({ 'retry-after': String(known.retryAfterSeconds) });
		error(known.status, known.message);
	}
	if (outcome.kind === 'linked') redirect(303, '/account?orcid=linked');
	if (outcome.kind === 'unknown') {
		keepPendingCookie(cookies, outcome.pendingHandle);
		redirect(303, '/login/orcid');
	}
	await startSession(lucia, cookies, outcome.userId);
	redirect(303, outcome.next);
};
