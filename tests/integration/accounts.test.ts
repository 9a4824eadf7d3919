import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { safeNext } from '../../src/lib/server/http/auth-web';
import {
	requestPasswordReset,
	resendVerification,
	resetPassword,
	signIn,
	signOutEverywhere,
	signUp,
	verifyEmail
} from '../../src/lib/server/accounts/accounts';
import { FieldError } from '../../src/lib/server/core/field-error';
import { hashSecret } from '../../src/lib/server/core/ids';
import { authenticate, createToken, listTokens } from '../../src/lib/server/accounts/tokens';
import { asUser } from './actors';
import { linkToken, mailTo, mailWorld, type MailWorld } from './mail-world';

const PASSWORD = 'lantern-fjord-quartz';

describe('accounts', () => {
	let world: MailWorld;
	beforeAll(async () => (world = await mailWorld()));
	afterAll(async () => world?.close());

	const user = async (email: string) =>
		(await world.database.models.User.findOne({ where: { email } }))!.get({ plain: true });
	const auditActions = async (subjectId: string) =>
		(await world.database.models.AuditEvent.findAll({ where: { subjectId } })).map((e) =>
			e.get('action')
		);

	it('signs up, mails a confirmation link, and the link works once only', async () => {
		const before = Date.now();
		const { userId } = await signUp(world.database, {
			email: '  Liv.Aasen@Fjordlight.TEST ',
			name: 'Liv Aasen',
			password: PASSWORD
		});
		const stored = await user('liv.aasen@fjordlight.test');
		expect(stored.id).toBe(userId);
		expect(stored.passwordHash).toMatch(/^\$argon2id\$/);
		expect(stored.emailVerifiedAt).toBeNull();

		const [mail] = await mailTo(world, 'liv.aasen@fjordlight.test');
		expect(mail.subject).toBe('Confirm your address for Rankseal');
		const token = await linkToken(world, 'liv.aasen@fjordlight.test', '/verify/');
		const row = await world.database.models.EmailToken.findOne({ where: { userId } });
		expect(row!.get('tokenHash')).toBe(hashSecret(token));
		// A day from sign-up, bracketed by clock readings around it: no allowance for speed.
		const expires = new Date(row!.get('expiresAt') as Date).getTime();
		expect(expires).toBeGreaterThanOrEqual(before + 24 * 3600e3);
		expect(expires).toBeLessThanOrEqual(Date.now() + 24 * 3600e3);

		expect(await verifyEmail(world.database, token)).toEqual({ ok: true, userId });
		expect((await user('liv.aasen@fjordlight.test')).emailVerifiedAt).not.toBeNull();
		expect(await verifyEmail(world.database, token)).toEqual({ ok: false, reason: 'used' });
		expect(await verifyEmail(world.database, 'not-a-token')).toEqual({
			ok: false,
			reason: 'unknown'
		});
		expect(await auditActions(userId)).toEqual(
			expect.arrayContaining(['account.signed-up', 'account.email-verified'])
		);
	});

	it('makes no second account for a taken address (in any case), and refuses a short password', async () => {
		const owner = await user('liv.aasen@fjordlight.test');
		await signUp(world.database, {
			email: 'LIV.AASEN@fjordlight.test',
			name: 'Other',
			password: 'another-passphrase-here'
		});
		// The owner hears of it by mail; the account is as it was (account-requests.test.ts has more).
		expect(await world.database.models.User.count({ where: { email: owner.email } })).toBe(1);
		expect((await user(owner.email)).passwordHash).toBe(owner.passwordHash);
		const [, notice] = await mailTo(world, owner.email);
		expect(notice.subject).toBe('Someone tried to open a Rankseal account with your address');
		const short = signUp(world.database, {
			email: 'short@fjordlight.test',
			name: 'Short',
			password: '123456789'
		});
		await expect(short).rejects.toBeInstanceOf(FieldError);
		await expect(short).rejects.toMatchObject({ field: 'password' });
		expect(
			await world.database.models.User.count({ where: { email: 'short@fjordlight.test' } })
		).toBe(0);
	});

	it('rejects an expired confirmation link, and a re-sent link replaces the old one', async () => {
		const { userId } = await signUp(world.database, {
			email: 'tor@fjordlight.test',
			name: 'Tor Lunde',
			password: PASSWORD
		});
		const first = await linkToken(world, 'tor@fjordlight.test', '/verify/');
		await world.database.models.EmailToken.update(
			{ expiresAt: new Date(Date.now() - 1000) },
			{ where: { tokenHash: hashSecret(first) } }
		);
		expect(await verifyEmail(world.database, first)).toEqual({ ok: false, reason: 'expired' });
		expect((await user('tor@fjordlight.test')).emailVerifiedAt).toBeNull();

		expect(await resendVerification(world.database, asUser(userId))).toBe(true);
		const second = await linkToken(world, 'tor@fjordlight.test', '/verify/');
		expect(second).not.toBe(first);
		expect(await verifyEmail(world.database, second)).toEqual({ ok: true, userId });
		expect(await resendVerification(world.database, asUser(userId))).toBe(false);
	});

	it('signs in with the right password only; an unknown address looks the same', async () => {
		const { userId } = await signUp(world.database, {
			email: 'ines@fjordlight.test',
			name: 'Ines Brekke',
			password: PASSWORD
		});
		expect(await signIn(world.database, 'Ines@Fjordlight.test', PASSWORD)).toEqual({ userId });
		expect(await signIn(world.database, 'ines@fjordlight.test', 'lantern-fjord-quartZ')).toBeNull();
		expect(await signIn(world.database, 'nobody@fjordlight.test', PASSWORD)).toBeNull();
	});

	/** An editor's API token (editors issue tokens without belonging to a group). */
	async function editorToken(userId: string): Promise<string> {
		await world.database.models.User.update({ accountRole: 'editor' }, { where: { id: userId } });
		return (await createToken(world.database, asUser(userId, 'editor'), { name: 'script' })).token;
	}

	it('resets a password by a one-hour, single-use link and ends every session and token', async () => {
		const { userId } = await signUp(world.database, {
			email: 'eirik@fjordlight.test',
			name: 'Eirik Moen',
			password: PASSWORD
		});
		const laptop = await world.lucia.createSession(userId, {});
		const phone = await world.lucia.createSession(userId, {});
		const script = await editorToken(userId);
		expect(await authenticate(world.database, script)).toMatchObject({ kind: 'token', userId });

		const asked = Date.now();
		await requestPasswordReset(world.database, ' EIRIK@fjordlight.test');
		const answered = Date.now();
		const token = await linkToken(world, 'eirik@fjordlight.test', '/reset/');
		const row = await world.database.models.EmailToken.findOne({
			where: { tokenHash: hashSecret(token) }
		});
		expect(row!.get('purpose')).toBe('reset-password');
		const expires = new Date(row!.get('expiresAt') as Date).getTime();
		expect(expires).toBeGreaterThanOrEqual(asked + 3600e3);
		expect(expires).toBeLessThanOrEqual(answered + 3600e3);

		const tooShort = resetPassword(world.database, world.lucia, token, 'short');
		await expect(tooShort).rejects.toMatchObject({ field: 'password' });
		const newPassword = 'harbour-willow-signal';
		expect(await resetPassword(world.database, world.lucia, token, newPassword)).toEqual({
			ok: true,
			userId
		});
		expect((await world.lucia.validateSession(laptop.id)).session).toBeNull();
		expect((await world.lucia.validateSession(phone.id)).session).toBeNull();
		// The mail says every session ended: a script's token is one of them.
		expect(await authenticate(world.database, script)).toBeNull();
		expect(await signIn(world.database, 'eirik@fjordlight.test', PASSWORD)).toBeNull();
		expect(await signIn(world.database, 'eirik@fjordlight.test', newPassword)).toEqual({ userId });
		expect(
			await resetPassword(world.database, world.lucia, token, 'another-long-password')
		).toEqual({ ok: false, reason: 'used' });
		const changed = (await mailTo(world, 'eirik@fjordlight.test')).at(-1)!;
		expect(changed.subject).toBe('Your Rankseal password was changed');
		// The mail says the script keys were revoked too (issue 18), in both bodies.
		expect(changed.text.replace(/\s+/g, ' ')).toContain(
			'every script key (API token) of the account was revoked'
		);
		expect((changed.html ?? '').replace(/\s+/g, ' ')).toContain(
			'every script key (API token) of the account was revoked'
		);
		expect(await auditActions(userId)).toContain('account.password-reset');
	});

	it('rejects an expired reset link, and writes an unknown address that it has no account', async () => {
		await signUp(world.database, {
			email: 'sol@fjordlight.test',
			name: 'Sol Haug',
			password: PASSWORD
		});
		await requestPasswordReset(world.database, 'sol@fjordlight.test');
		const token = await linkToken(world, 'sol@fjordlight.test', '/reset/');
		await world.database.models.EmailToken.update(
			{ expiresAt: new Date(Date.now() - 1) },
			{ where: { tokenHash: hashSecret(token) } }
		);
		expect(
			await resetPassword(world.database, world.lucia, token, 'harbour-willow-signal')
		).toEqual({ ok: false, reason: 'expired' });

		const tokens = await world.database.models.EmailToken.count();
		await expect(
			requestPasswordReset(world.database, 'ghost@fjordlight.test')
		).resolves.toBeUndefined();
		const [letter] = await mailTo(world, 'ghost@fjordlight.test');
		expect(letter.subject).toBe('A Rankseal password was requested for this address');
		expect(letter.text).not.toContain('/reset/');
		expect(await world.database.models.EmailToken.count()).toBe(tokens);
	});

	it('signs out everywhere, API tokens included', async () => {
		const { userId } = await signUp(world.database, {
			email: 'kai@fjordlight.test',
			name: 'Kai Rud',
			password: PASSWORD
		});
		const sessions = await Promise.all([
			world.lucia.createSession(userId, {}),
			world.lucia.createSession(userId, {})
		]);
		const script = await editorToken(userId);
		await signOutEverywhere(world.database, world.lucia, asUser(userId, 'editor'));
		for (const s of sessions) expect((await world.lucia.validateSession(s.id)).session).toBeNull();
		expect(await authenticate(world.database, script)).toBeNull();
		const [token] = await listTokens(world.database, asUser(userId, 'editor'));
		expect(token.revokedAt).not.toBeNull();
	});
});

describe('safeNext', () => {
	it('keeps same-origin relative paths and drops everything else', () => {
		expect(safeNext('/claims/abc?tab=checks')).toBe('/claims/abc?tab=checks');
		expect(safeNext('/invite/tok_-1')).toBe('/invite/tok_-1');
		for (const bad of [
			'https://evil.test/',
			'//evil.test',
			'/\\evil.test',
			'claims',
			'/\tevil',
			'',
			null
		]) {
			expect(safeNext(bad)).toBe('/claims');
		}
	});
});
