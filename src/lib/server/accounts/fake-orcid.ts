/**
 * The local fake ORCID: a real OpenID provider (oidc-provider) on 127.0.0.1 that signs real
 * ID tokens (RS256, a key made at start), for development, the demo and the tests, like the mail
 * catcher. Its sign-in page (fake-orcid-page.ts) lets a person pick or type any valid ORCID iD.
 */
import { generateKeyPairSync, randomBytes } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import Provider, { type Configuration, type KoaContextWithOIDC } from 'oidc-provider';
import { answerInteraction, type FakePeople } from './fake-orcid-page';

export interface FakeOrcid {
	issuer: string;
	port: number;
	close(): Promise<void>;
}

export interface FakeOrcidClient {
	clientId: string;
	clientSecret: string;
	redirectUri: string;
}

/** ORCID puts the names in the ID token on scope openid alone; the fake does the same. */
function configuration(client: FakeOrcidClient, people: FakePeople): Configuration {
	const jwk = generateKeyPairSync('rsa', { modulusLength: 2048 }).privateKey.export({
		format: 'jwk'
	});
	return {
		clients: [
			{
				client_id: client.clientId,
				client_secret: client.clientSecret,
				redirect_uris: [client.redirectUri],
				grant_types: ['authorization_code'],
				response_types: ['code'],
				token_endpoint_auth_method: 'client_secret_post'
			}
		],
		claims: { openid: ['sub', 'given_name', 'family_name', 'name'] },
		conformIdTokenClaims: false,
		clientBasedCORS: () => false,
		cookies: { keys: [randomBytes(32).toString('hex')] },
		features: { devInteractions: { enabled: false } },
		findAccount: (_ctx, sub) => ({ accountId: sub, claims: () => ({ sub, ...people.get(sub) }) }),
		interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
		jwks: { keys: [{ ...jwk, alg: 'RS256', use: 'sig', kid: 'fake-orcid-1' }] },
		loadExistingGrant: grantEverything,
		pkce: { required: () => true },
		responseTypes: ['code'],
		ttl: {
			AccessToken: 600,
			AuthorizationCode: 60,
			IdToken: 600,
			Interaction: 600,
			Session: 600,
			Grant: 600
		}
	} as Configuration;
}

/** No consent screen: the fake grants the client what it asked for once the person chose an iD. */
async function grantEverything(ctx: KoaContextWithOIDC) {
	const { Grant } = ctx.oidc.provider;
	const clientId = ctx.oidc.client!.clientId;
	const existing = ctx.oidc.session?.grantIdFor(clientId);
	if (existing) return Grant.find(existing);
	const grant = new Grant({ clientId, accountId: ctx.oidc.session!.accountId! });
	grant.addOIDCScope('openid');
	await grant.save();
	ctx.oidc.session!.grantIdFor(clientId, grant.jti);
	return grant;
}

function listen(server: http.Server, port: number): Promise<number> {
	return new Promise((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, '127.0.0.1', () => {
			server.off('error', reject);
			resolve((server.address() as AddressInfo).port);
		});
	});
}

/** Binds the port (or any free one when it is taken, logged), then starts the provider on it. */
async function bind(port: number): Promise<{ server: http.Server; port: number }> {
	const server = http.createServer();
	try {
		return { server, port: await listen(server, port) };
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		if (code !== 'EADDRINUSE' && code !== 'EACCES') throw error;
		console.warn(`fake ORCID: port ${port} is not available (${code}); using a free port instead`);
		const other = http.createServer();
		return { server: other, port: await listen(other, 0) };
	}
}

export async function startFakeOrcid(port: number, client: FakeOrcidClient): Promise<FakeOrcid> {
	const bound = await bind(port);
	const issuer = `http://127.0.0.1:${bound.port}`;
	const people: FakePeople = new Map();
	const provider = new Provider(issuer, configuration(client, people));
	provider.on('server_error', (_ctx, error) => console.error('fake ORCID:', error));
	const handle = provider.callback();
	bound.server.on('request', (req, res) => {
		if (req.url?.startsWith('/interaction/'))
			answerInteraction(provider, people, req, res).catch((error: Error) => {
				console.error('fake ORCID:', error);
				if (!res.headersSent) res.writeHead(500).end(`fake ORCID: ${error.message}`);
			});
		else handle(req, res);
	});
	console.log(`fake ORCID: OpenID provider at ${issuer}`);
	const close = () =>
		new Promise<void>((resolve) => {
			bound.server.close(() => resolve());
			bound.server.closeAllConnections();
		});
	return { issuer, port: bound.port, close };
}
