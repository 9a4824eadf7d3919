/**
 * Where ORCID sign-in goes. ORCID_ISSUER (https://orcid.org, or https://sandbox.orcid.org) with
 * ORCID_CLIENT_ID and ORCID_CLIENT_SECRET name a real provider; without ORCID_ISSUER the app
 * starts the local fake (fake-orcid.ts) on ORCID_FAKE_PORT (default 2727; 0: any free port).
 */
import { randomBytes } from 'node:crypto';
import { startFakeOrcid, type FakeOrcid } from './fake-orcid';

export interface OrcidService {
	issuer: string;
	clientId: string;
	clientSecret: string;
	/** Where the provider sends the browser back: the origin's /login/orcid/callback. */
	redirectUri: string;
	/** The local fake provider when no ORCID_ISSUER is set. */
	fake: FakeOrcid | null;
}

export const orcidCallbackPath = '/login/orcid/callback';

/** A real provider from the environment, or null; a half-given one stops the start naming what is missing. */
function realProvider(
	env: NodeJS.ProcessEnv
): { issuer: string; clientId: string; clientSecret: string } | null {
	const issuer = env.ORCID_ISSUER?.trim();
	if (!issuer) return null;
	for (const name of ['ORCID_CLIENT_ID', 'ORCID_CLIENT_SECRET'])
		if (!env[name]?.trim()) throw new Error(`ORCID_ISSUER is set, so ${name} must be set too.`);
	return {
		issuer,
		clientId: env.ORCID_CLIENT_ID!.trim(),
		clientSecret: env.ORCID_CLIENT_SECRET!.trim()
	};
}

export async function startOrcid(origin: string, env = process.env): Promise<OrcidService> {
	const redirectUri = new URL(orcidCallbackPath, origin).href;
	const real = realProvider(env);
	if (real) return { ...real, redirectUri, fake: null };
	const client = {
		clientId: 'rankseal-local',
		clientSecret: randomBytes(24).toString('hex'),
		redirectUri
	};
	const port = Number(env.ORCID_FAKE_PORT ?? '2727');
	const fake = await startFakeOrcid(Number.isInteger(port) && port >= 0 ? port : 2727, client);
	return {
		issuer: fake.issuer,
		clientId: client.clientId,
		clientSecret: client.clientSecret,
		redirectUri,
		fake
	};
}
