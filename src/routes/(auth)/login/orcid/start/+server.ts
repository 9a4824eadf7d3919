import { error, redirect } from '@sveltejs/kit';
import { keepAttemptCookie } from '$lib/server/accounts/orcid-cookies';
import { beginOrcidSignIn } from '$lib/server/accounts/orcid-sign-in';
import { app } from '$lib/server/app/app';
import { safeNext } from '$lib/server/http/auth-web';
import { problemOf } from '$lib/server/http/problems';
import type { RequestHandler } from './$types';

/**
 * Starts a sign-in with ORCID (?next= a path), or with ?link=1 a link to the signed-in account.
 * A link (GET, since the CSP's form-action keeps forms from redirecting off-site) is started only
 * from Rankseal's own pages: another site's link or script cannot make a signed-in browser link.
 */
export const GET: RequestHandler = async (event) => {
	const { url, locals, request } = event;
	const next = safeNext(url.searchParams.get('next'));
	let linkFor: string | null = null;
	if (url.searchParams.has('link')) {
		if (locals.actor.kind !== 'user') redirect(303, '/login?next=/account');
		const site = request.headers.get('sec-fetch-site');
		if (site && site !== 'same-origin' && site !== 'none')
			error(403, 'Link an ORCID iD from your account page on Rankseal itself.');
		linkFor = locals.actor.userId;
	}
	const { orcid } = await app();
	let started;
	try {
		const intent = { next: linkFor ? '/account' : next, linkFor };
		started = await beginOrcidSignIn(orcid, intent, { address: event.getClientAddress() });
	} catch (problem) {
		const known = problemOf(problem);
		if (!known) throw problem;
		if (known.retryAfterSeconds)
			event.setHeaders({ 'retry-after': String(known.retryAfterSeconds) });
		error(known.status, known.message);
	}
	keepAttemptCookie(event.cookies, started.handle);
	redirect(303, started.url.href);
};
