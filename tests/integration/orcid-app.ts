/**
 * The app started in-process for the ORCID integration tests (its own data folder, the fake ORCID
 * on any free port), with people to sign in and one browser's round through start, the fake's
 * page and the callback (orcid-world.ts drives the HTTP side).
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { expect } from 'vitest';
import { AppJar, ProviderBrowser, outcome, signInAtProvider, type Choice } from './orcid-world';

process.env.RANKSEAL_DATA_DIR = mkdtempSync(path.join(tmpdir(), 'rankseal-orcid-'));
process.env.MAIL_CATCHER_PORT = '0';
process.env.ORCID_FAKE_PORT = '0';
process.env.ORIGIN = 'http://127.0.0.1:5999';
delete process.env.ORCID_ISSUER;

const { app } = await import('../../src/lib/server/app/app');
const { hashPassword } = await import('../../src/lib/server/accounts/auth');
const { newId } = await import('../../src/lib/server/core/ids');
export const start = await import('../../src/routes/(auth)/login/orcid/start/+server');
export const callback = await import('../../src/routes/(auth)/login/orcid/callback/+server');
export const linkPage = await import('../../src/routes/(auth)/login/orcid/+page.server');

export const CARBERRY = '0000-0002-1825-0097';
export const WITH_X = '0000-0002-1694-233X';
export const PASSWORD = 'lantern-basalt-orchard';
type Services = Awaited<ReturnType<typeof app>>;
/** The app's services, started once per test file. */
export const services: Services = await app();

export async function person(name: string, orcid: string | null = null) {
	const id = newId();
	const email = `${name.toLowerCase()}.${id.slice(0, 6)}@example.test`;
	const passwordHash = await hashPassword(PASSWORD);
	const fields = { id, email, name, passwordHash, accountRole: 'researcher' as const };
	await services.database.models.User.create({ ...fields, emailVerifiedAt: new Date(), orcid });
	return { id, email };
}

const actorOf = (userId: string | null) =>
	userId
		? { kind: 'user', userId, accountRole: 'researcher', emailVerified: true }
		: { kind: 'anonymous' };

export function event(jar: AppJar, url: string, userId: string | null = null, extra = {}) {
	const headers = new Headers();
	return {
		cookies: jar.cookies,
		url: new URL(url, process.env.ORIGIN),
		locals: { actor: actorOf(userId), user: null, session: null },
		request: new Request(new URL(url, process.env.ORIGIN), { headers }),
		getClientAddress: () => '192.0.2.10',
		setHeaders: () => undefined,
		...extra
	} as never;
}

/** Start → provider (its page) → callback, as one browser; what the callback did. */
export async function orcidRound(
	jar: AppJar,
	choice: Choice,
	options: { startAs?: string | null; callbackAs?: string | null; link?: boolean } = {}
) {
	const query = options.link ? '?link=1' : '?next=/claims';
	const started = await outcome(() =>
		start.GET(event(jar, `/login/orcid/start${query}`, options.startAs ?? null))
	);
	expect(started.status).toBe(303);
	const atProvider = await signInAtProvider(new ProviderBrowser(), started.location!, choice);
	if (!('callback' in atProvider)) throw new Error(`provider page ${atProvider.status}`);
	const back = atProvider.callback;
	expect(back.origin + back.pathname).toBe(`${process.env.ORIGIN}/login/orcid/callback`);
	const url = back.pathname + back.search;
	return {
		back,
		answer: await outcome(() => callback.GET(event(jar, url, options.callbackAs ?? null)))
	};
}

export async function sessionUser(jar: AppJar): Promise<string | null> {
	const id = jar.get(services.lucia.sessionCookieName);
	if (!id) return null;
	return (await services.lucia.validateSession(id)).user?.id ?? null;
}

export const orcidOf = async (userId: string) =>
	(await services.database.models.User.findByPk(userId))!.get('orcid');
