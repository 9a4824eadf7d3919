/**
 * Sign in with ORCID, start to end. A start keeps state, nonce and PKCE verifier under a handle
 * for the browser's cookie and sends the browser to the provider; the callback takes that handle
 * (once), refuses an answer whose state differs, exchanges the code, and then: a known iD signs
 * in; an iD asked for from the account page is linked to that signed-in account; an unknown iD
 * waits (orcidPending) until the person signs in to an account with its password, which links it.
 */
import * as oidc from 'openid-client';
import { userActor, type Actor } from '../core/actor';
import type { Database } from '../db';
import { takeOrRefuse } from '../core/rate-limits';
import { FieldError, ForbiddenError } from '../core/errors';
import { signInFrom, type SignInOutcome } from './sign-in';
import { orcidAttempts, orcidPending, type OrcidPending } from './orcid-attempts';
import { authorisationUrl, exchangeCode, freshSecrets, type OrcidPerson } from './orcid-client';
import { accountWithOrcid, linkOrcid } from './orcid-links';
import type { OrcidService } from './orcid-settings';

const AGAIN = 'Start again from the sign-in page.';

/** Counts one ORCID start or callback per client address (the limit table's orcidSignIn). */
const takeTurn = (address: string) =>
	takeOrRefuse('orcidSignIn', address, 'Too many ORCID sign-ins from your network address.');

/** The provider URL to send the browser to, and the handle its cookie carries back. */
export async function beginOrcidSignIn(
	service: OrcidService,
	intent: { next: string; linkFor: string | null },
	client: { address: string }
): Promise<{ url: URL; handle: string }> {
	await takeTurn(client.address);
	const secrets = freshSecrets();
	const url = await authorisationUrl(service, secrets);
	return { url, handle: orcidAttempts.keep({ ...secrets, ...intent }) };
}

export type OrcidOutcome =
	| { kind: 'signed-in'; userId: string; next: string }
	| { kind: 'linked'; userId: string }
	| { kind: 'unknown'; pendingHandle: string; person: OrcidPerson };

/** The person ORCID vouches for, or a FieldError saying why the answer was refused. */
async function verifiedPerson(
	service: OrcidService,
	handle: string | undefined,
	query: URLSearchParams
) {
	const attempt = orcidAttempts.take(handle);
	if (!attempt)
		throw new FieldError(
			'state',
			`No ORCID sign-in is in progress in this browser (or it is older than 10 minutes). ${AGAIN}`
		);
	if (query.get('state') !== attempt.state)
		throw new FieldError(
			'state',
			`ORCID's answer does not belong to the sign-in this browser started (the state differs), so it was refused. ${AGAIN}`
		);
	const refused = query.get('error');
	if (refused)
		throw new FieldError(
			'',
			`ORCID did not sign you in (${query.get('error_description') ?? refused}). ${AGAIN}`
		);
	try {
		return { attempt, person: await exchangeCode(service, attempt, query) };
	} catch (problem) {
		if (problem instanceof FieldError) throw problem;
		if (
			problem instanceof oidc.ClientError ||
			problem instanceof oidc.ResponseBodyError ||
			problem instanceof oidc.AuthorizationResponseError
		)
			throw new FieldError(
				'',
				`ORCID's answer could not be verified (${problem.message}). ${AGAIN}`
			);
		throw problem;
	}
}

/** Completes the sign-in the callback names; the route starts a session or shows the link page. */
export async function finishOrcidSignIn(
	database: Database,
	service: OrcidService,
	request: { handle: string | undefined; query: URLSearchParams; actor: Actor; address: string }
): Promise<OrcidOutcome> {
	await takeTurn(request.address);
	const { attempt, person } = await verifiedPerson(service, request.handle, request.query);
	if (attempt.linkFor) {
		// Linking from the account page: only the very account that asked, still signed in.
		if (request.actor.kind !== 'user' || request.actor.userId !== attempt.linkFor)
			throw new ForbiddenError(
				'Sign in to the account that asked to link this ORCID iD, then try again.'
			);
		await linkOrcid(database, request.actor, person.orcid);
		return { kind: 'linked', userId: attempt.linkFor };
	}
	const userId = await accountWithOrcid(database, person.orcid);
	if (userId) return { kind: 'signed-in', userId, next: attempt.next };
	const pending: OrcidPending = { ...person, next: attempt.next };
	return { kind: 'unknown', pendingHandle: orcidPending.keep(pending), person };
}

/**
 * Signs in with e-mail and password (the sign-in ladders apply) and links the waiting iD to that
 * account; the iD is forgotten once linked. A wrong password links nothing.
 */
export async function linkPendingByPassword(
	database: Database,
	handle: string | undefined,
	input: { email: string; password: string },
	client: { address: string }
): Promise<SignInOutcome & { pending: OrcidPending }> {
	const pending = orcidPending.peek(handle);
	if (!pending)
		throw new FieldError(
			'',
			`No ORCID iD is waiting to be linked in this browser (it waits 15 minutes). ${AGAIN}`
		);
	const outcome = await signInFrom(database, input, client);
	if (outcome.userId) {
		await linkOrcid(database, (await userActor(database, outcome.userId))!, pending.orcid);
		orcidPending.take(handle);
	}
	return { ...outcome, pending };
}
