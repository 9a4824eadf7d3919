/**
 * What sign in with ORCID refuses, against the real fake provider and a real SQLite file: an
 * answer whose state differs from the browser's, a callback in a browser that started nothing or
 * a replayed one, an iD with a wrong check character (ORCID's example 0000-0002-1825-0097 with its
 * last digit changed), too many starts from one address, and an iD another account has.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { resetRateLimits } from '../../src/lib/server/core/rate-limits';
import { AppJar, ProviderBrowser, outcome, signInAtProvider } from './orcid-world';
import { callback, event, orcidOf, orcidRound, person, sessionUser, start } from './orcid-app';

afterEach(() => {
	delete process.env.RANKSEAL_RATE_LIMITS;
	resetRateLimits();
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
		const started = await outcome(() => start.GET(event(jar, '/login/orcid/start')));
		const handle = jar.get('rankseal_orcid')!;
		const atProvider = await signInAtProvider(new ProviderBrowser(), started.location!, {
			orcid: '0000-0001-5109-3700'
		});
		const back = (atProvider as { callback: URL }).callback;
		const url = back.pathname + back.search;
		const other = await outcome(() => callback.GET(event(new AppJar(), url)));
		expect(other).toMatchObject({
			status: 400,
			message: expect.stringMatching(/No ORCID sign-in is in progress/)
		});
		expect((await outcome(() => callback.GET(event(jar, url)))).status).toBe(303);
		// The same answer with the same cookie again: the sign-in was used up by the first.
		const replay = new AppJar();
		replay.values.set('rankseal_orcid', handle);
		const again = await outcome(() => callback.GET(event(replay, url)));
		expect(again).toMatchObject({
			status: 400,
			message: expect.stringMatching(/No ORCID sign-in/)
		});
		expect(await sessionUser(replay)).toBeNull();
	});

	it('refuses a forged code (the token endpoint says no) and a cancelled sign-in, in words', async () => {
		const forged = new AppJar();
		const started = await outcome(() => start.GET(event(forged, '/login/orcid/start')));
		const atProvider = await signInAtProvider(new ProviderBrowser(), started.location!, {
			orcid: '0000-0003-1415-9269'
		});
		const back = (atProvider as { callback: URL }).callback;
		back.searchParams.set('code', 'a-code-the-provider-never-issued');
		const answer = await outcome(() => callback.GET(event(forged, back.pathname + back.search)));
		expect(answer).toMatchObject({
			status: 400,
			message: expect.stringMatching(/could not be verified/)
		});
		expect(await sessionUser(forged)).toBeNull();

		const cancelled = new AppJar();
		const again = await outcome(() => start.GET(event(cancelled, '/login/orcid/start')));
		const left = await signInAtProvider(new ProviderBrowser(), again.location!, { cancel: '1' });
		const home = (left as { callback: URL }).callback;
		const said = await outcome(() => callback.GET(event(cancelled, home.pathname + home.search)));
		expect(said).toMatchObject({
			status: 400,
			message: expect.stringMatching(/ORCID did not sign you in \(The person cancelled/)
		});
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
