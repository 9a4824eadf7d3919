/**
 * The OpenID Connect client side of ORCID sign-in (openid-client): discovery, the authorisation
 * URL with state, nonce and a PKCE S256 challenge, and the code exchange, which checks the state,
 * the ID token's signature, issuer, audience, expiry and nonce, and the PKCE verifier.
 */
import * as oidc from 'openid-client';
import { parseOrcid } from '$lib/orcid-id';
import { FieldError } from '../core/errors';
import type { OrcidAttempt } from './orcid-attempts';
import type { OrcidService } from './orcid-settings';

const configurations = new Map<string, Promise<oidc.Configuration>>();

/** The provider's metadata, fetched once per issuer and client; a failed fetch is tried again next time. */
function configurationFor(service: OrcidService): Promise<oidc.Configuration> {
	const key = `${service.issuer}\n${service.clientId}`;
	let found = configurations.get(key);
	if (!found) {
		// Plain http only for a provider on this machine (the fake); a real one must use https.
		const local = /^http:\/\/(127\.0\.0\.1|localhost)(:\d+)?$/.test(service.issuer);
		found = oidc.discovery(
			new URL(service.issuer),
			service.clientId,
			{ client_secret: service.clientSecret },
			oidc.ClientSecretPost(service.clientSecret),
			local ? { execute: [oidc.allowInsecureRequests] } : undefined
		);
		found.catch(() => configurations.delete(key));
		configurations.set(key, found);
	}
	return found;
}

export async function authorisationUrl(
	service: OrcidService,
	attempt: Pick<OrcidAttempt, 'state' | 'nonce' | 'verifier'>
): Promise<URL> {
	const configuration = await configurationFor(service);
	return oidc.buildAuthorizationUrl(configuration, {
		redirect_uri: service.redirectUri,
		response_type: 'code',
		scope: 'openid',
		state: attempt.state,
		nonce: attempt.nonce,
		code_challenge: await oidc.calculatePKCECodeChallenge(attempt.verifier),
		code_challenge_method: 'S256'
	});
}

export const freshSecrets = () => ({
	state: oidc.randomState(),
	nonce: oidc.randomNonce(),
	verifier: oidc.randomPKCECodeVerifier()
});

export interface OrcidPerson {
	orcid: string;
	name: string | null;
}

const nameOf = (claims: Record<string, unknown>): string | null => {
	const text = (value: unknown) => (typeof value === 'string' ? value.trim() : '');
	const joined = `${text(claims.given_name)} ${text(claims.family_name)}`.trim();
	return (text(claims.name) || joined).slice(0, 200) || null;
};

/** Exchanges the code in the callback's query; the person's iD (the ID token's `sub`) and name. */
export async function exchangeCode(
	service: OrcidService,
	attempt: OrcidAttempt,
	query: URLSearchParams
): Promise<OrcidPerson> {
	const configuration = await configurationFor(service);
	const callback = new URL(service.redirectUri);
	for (const [key, value] of query) callback.searchParams.append(key, value);
	const tokens = await oidc.authorizationCodeGrant(configuration, callback, {
		pkceCodeVerifier: attempt.verifier,
		expectedState: attempt.state,
		expectedNonce: attempt.nonce,
		idTokenExpected: true
	});
	const claims = tokens.claims()!;
	const orcid = parseOrcid(claims.sub);
	if (!orcid)
		throw new FieldError(
			'sub',
			`ORCID answered with “${claims.sub}”, which is not a valid ORCID iD.`
		);
	return { orcid, name: nameOf(claims) };
}
