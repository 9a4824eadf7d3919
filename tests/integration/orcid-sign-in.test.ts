/**
 * Sign in with ORCID end to end against the real fake provider (oidc-provider over HTTP, real
 * RS256 ID tokens) and a real SQLite file: a known iD signs in; an unknown one creates and links
 * nothing until a password sign-in links it; a link asked for from the account page goes to that
 * account only. Example iDs are ORCID's own (support article "Structure of the ORCID Identifier":
 * 0000-0002-1825-0097, 0000-0002-1694-233X).
 */
import { describe, expect, it } from 'vitest';
import { AppJar, outcome } from './orcid-world';
import {
	CARBERRY,
	PASSWORD,
	WITH_X,
	event,
	linkPage,
	orcidOf,
	orcidRound,
	person,
	services,
	sessionUser
} from './orcid-app';

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
		const { AuditEvent } = services.database.models;
		const linked = await AuditEvent.findOne({
			where: { action: 'account.orcid-linked', subjectId: ben.id }
		});
		expect(linked?.get('details')).toMatchObject({ orcid: WITH_X });
		expect(await sessionUser(jar)).toBe(ben.id);

		// From now on the iD signs straight in, in a fresh browser.
		const fresh = new AppJar();
		expect((await orcidRound(fresh, { orcid: WITH_X })).answer.location).toBe('/claims');
		expect(await sessionUser(fresh)).toBe(ben.id);
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
});
