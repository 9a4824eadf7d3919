/**
 * Sign in with ORCID end to end against the real fake provider (oidc-provider over HTTP, real
 * RS256 ID tokens) and a real SQLite file: a known iD signs in; an unknown one creates and links
 * nothing until a password sign-in; a changed state, a missing or replayed sign-in, a foreign
 * account at a link's callback and a mistyped iD are refused. Example iDs are ORCID's own
 * (support article "Structure of the ORCID Identifier": 0000-0002-1825-0097, 0000-0002-1694-233X).
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { AppJar, ProviderBrowser, outcome, signInAtProvider, type Choice } from './orcid-world';

process.env.RANKSEAL_DATA_DIR = mkdtempSync(path.join(tmpdir(), 'rankseal-orcid-'));
process.env.MAIL_CATCHER_PORT = '0';
process.env.ORCID_FAKE_PORT = '0';
process.env.ORIGIN = 'http://127.0.0.1:5999';
delete process.env.ORCID_ISSUER;

const { app } = await import('../../src/lib/server/app');
const { hashPassword } = await import('../../src/lib/server/auth');
const { newId } = await import('../../src/lib/server/services/ids');
const { resetRateLimits } = await import('../../src/lib/server/rate-limits');
const start = await import('../../src/routes/(auth)/login/orcid/start/+server');
const callback = await import('../../src/routes/(auth)/login/orcid/callback/+server');
const linkPage = await import('../../src/routes/(auth)/login/orcid/+page.server');

const CARBERRY = '0000-0002-1825-0097';
const WITH_X = '0000-0002-1694-233X';
const PASSWORD = 'lantern-basalt-orchard';
type Services = Awaited<ReturnType<typeof app>>;
let services: Services;

async function person(name: string, orcid: string | null = null) {
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

function event(jar: AppJar, url: string, userId: string | null = null, extra = {}) {
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
async function orcidRound(
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

async function sessionUser(jar: AppJar): Promise<string | null> {
	const id = jar.get(services.lucia.sessionCookieName);
	if (!id) return null;
	return (await services.lucia.validateSession(id)).user?.id ?? null;
}

const orcidOf = async (userId: string) =>
	(await services.database.models.User.findByPk(userId))!.get('orcid');

beforeAll(async () => {
	services = await app();
});
afterEach(() => {
	delete process.env.RANKSEAL_RATE_LIMITS;
	resetRateLimits();
});

describe('a known iD', () => {
	it('signs straight in to the account it is linked to', async () => {
		const ada = await person('Ada', CARBERRY);
		const jar = new AppJar();
		const { answer } = await orcidRound(jar, {
			orcid: CARBERRY,
			given_name: 'Josiah',
			family_name: 'Carberry'
		});
		expect(answer).toEqual({ status: 303, location: '/claims' });
		expect(await sessionUser(jar)).toBe(ada.id);
	});
});

describe('an unknown iD', () => {
	it('creates and links nothing until the person signs in with a password, then links', async () => {
		const ben = await person('Ben');
		const users = await services.database.models.User.count();
		const jar = new AppJar();
		const { answer } = await orcidRound(jar, {
			orcid: WITH_X,
			given_name: 'Ben',
			family_name: 'Ash'
		});
		expect(answer).toEqual({ status: 303, location: '/login/orcid' });
		expect(await sessionUser(jar)).toBeNull();
		expect(await services.database.models.User.count()).toBe(users);
		expect(await services.database.models.User.count({ where: { orcid: WITH_X } })).toBe(0);
		const shown = (await linkPage.load(event(jar, '/login/orcid'))) as { pending: unknown };
		expect(shown.pending).toEqual({ orcid: WITH_X, name: 'Ben Ash' });

		const post = (password: string) => {
			const form = new FormData();
			form.set('email', ben.email);
			form.set('password', password);
			return new Request(`${process.env.ORIGIN}/login/orcid?/link`, { method: 'POST', body: form });
		};
		const wrong = await outcome(() =>
			linkPage.actions.link(
				event(jar, '/login/orcid?/link', null, { request: post('not-the-password') })
			)
		);
		expect(JSON.stringify(wrong.value)).toMatch(/do not match an account/);
		expect(await orcidOf(ben.id)).toBeNull();

		const right = await outcome(() =>
			linkPage.actions.link(event(jar, '/login/orcid?/link', null, { request: post(PASSWORD) }))
		);
		expect(right).toEqual({ status: 303, location: '/claims' });
		expect(await orcidOf(ben.id)).toBe(WITH_X);
		expect(await sessionUser(jar)).toBe(ben.id);

		// From now on the iD signs straight in, in a fresh browser.
		const fresh = new AppJar();
		expect((await orcidRound(fresh, { orcid: WITH_X })).answer.location).toBe('/claims');
		expect(await sessionUser(fresh)).toBe(ben.id);
	});
});

describe('refused answers', () => {
	it('refuses a callback whose state differs from the one this browser started, and signs nobody in', async () => {
		await person('Cleo', '0000-0003-1415-9269');
		const jar = new AppJar();
		const started = await outcome(() => start.GET(event(jar, '/login/orcid/start')));
		const atProvider = await signInAtProvider(new ProviderBrowser(), started.location!, {
			orcid: '0000-0003-1415-9269'
		});
		const back = (atProvider as { callback: URL }).callback;
		back.searchParams.set('state', 'forged-state-value');
		const answer = await outcome(() => callback.GET(event(jar, back.pathname + back.search)));
		expect(answer.status).toBe(400);
		expect(answer.message).toMatch(/state differs/);
		expect(await sessionUser(jar)).toBeNull();
	});

	it('refuses a callback in a browser that started no sign-in, and the same answer twice', async () => {
		await person('Dag', '0000-0001-5109-3700');
		const jar = new AppJar();
		const { back, answer } = await orcidRound(jar, { orcid: '0000-0001-5109-3700' });
		expect(answer.status).toBe(303);
		const url = back.pathname + back.search;
		const other = await outcome(() => callback.GET(event(new AppJar(), url)));
		expect(other).toMatchObject({
			status: 400,
			message: expect.stringMatching(/No ORCID sign-in is in progress/)
		});
		const replay = new AppJar();
		replay.values.set('rankseal_orcid', 'a-handle-used-before');
		expect((await outcome(() => callback.GET(event(replay, url)))).status).toBe(400);
	});

	it('the fake provider refuses an iD with a wrong check character, naming it', async () => {
		const jar = new AppJar();
		const started = await outcome(() => start.GET(event(jar, '/login/orcid/start')));
		const page = await signInAtProvider(new ProviderBrowser(), started.location!, {
			orcid: '0000-0002-1825-0098'
		});
		expect(page).toMatchObject({
			status: 400,
			text: expect.stringMatching(/wrong check character/)
		});
	});

	it('rate-limits starts per client address like sign-in (429)', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({ orcidSignIn: { points: 2 } });
		resetRateLimits();
		const jar = new AppJar();
		for (let i = 0; i < 2; i++)
			expect((await outcome(() => start.GET(event(jar, '/login/orcid/start')))).status).toBe(303);
		expect(await outcome(() => start.GET(event(jar, '/login/orcid/start')))).toMatchObject({
			status: 429,
			message: expect.stringMatching(/Too many ORCID sign-ins/)
		});
	});
});

describe('linking from the account page', () => {
	it('links to the signed-in account that asked, and to no other account at the callback', async () => {
		const eva = await person('Eva');
		const finn = await person('Finn');
		const jar = new AppJar();
		const foreign = await orcidRound(
			jar,
			{ orcid: '0009-0099-0004-0007' },
			{ link: true, startAs: eva.id, callbackAs: finn.id }
		);
		expect(foreign.answer.status).toBe(403);
		expect([await orcidOf(eva.id), await orcidOf(finn.id)]).toEqual([null, null]);
		const own = await orcidRound(
			jar,
			{ orcid: '0009-0099-0004-0007' },
			{ link: true, startAs: eva.id, callbackAs: eva.id }
		);
		expect(own.answer).toEqual({ status: 303, location: '/account?orcid=linked' });
		expect(await orcidOf(eva.id)).toBe('0009-0099-0004-0007');
	});

	it('refuses an iD another account has (409), linking nothing', async () => {
		await person('Gus', '0009-0099-0002-0006');
		const hal = await person('Hal');
		const { answer } = await orcidRound(
			new AppJar(),
			{ pick: '0009-0099-0002-0006' },
			{ link: true, startAs: hal.id, callbackAs: hal.id }
		);
		expect(answer).toMatchObject({
			status: 409,
			message: expect.stringMatching(/already linked to another/)
		});
		expect(await orcidOf(hal.id)).toBeNull();
	});
});
