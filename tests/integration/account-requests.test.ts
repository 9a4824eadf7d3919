/**
 * Abuse of the account paths, against a real SQLite file and the real mail catcher: sign-up and
 * reset do the same work whether or not the address has an account (counted in rows, never
 * timed), sign-in pauses grow and a success clears them, and the outbox holds mail past the
 * per-recipient cap. Common practice (OWASP authentication guidance, from memory): the same
 * answer for known and unknown addresses, back-off on failed sign-ins, a cap on mail per address.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { resetRateLimits } from '../../src/lib/server/core/rate-limits';
import { requestPasswordReset, signUp } from '../../src/lib/server/accounts/accounts';
import { listOutbox, requeueOutboxMessage } from '../../src/lib/server/mail/mail-outbox';
import { signInFrom } from '../../src/lib/server/accounts/sign-in';
import { deliverDue } from '../../src/lib/server/mail/mail-sender';
import { asUser } from './actors';
import { mailTo, mailWorld, type MailWorld } from './mail-world';

const PASSWORD = 'cormorant-lantern-basalt';

let world: MailWorld;
beforeAll(async () => (world = await mailWorld()));
afterAll(async () => world?.close());
afterEach(() => {
	delete process.env.RANKSEAL_RATE_LIMITS;
	resetRateLimits();
	vi.useRealTimers();
});

/** Rows per table, to compare what two paths wrote. */
async function rowCounts() {
	const { User, EmailToken, AuditEvent, OutboxMail } = world.database.models;
	return {
		users: await User.count(),
		emailTokens: await EmailToken.count(),
		audit: await AuditEvent.count(),
		outbox: await OutboxMail.count()
	};
}

async function written(work: () => Promise<unknown>) {
	const before = await rowCounts();
	await work();
	const after = await rowCounts();
	return Object.fromEntries(Object.entries(after).map(([k, v]) => [k, v - before[k as 'users']]));
}

describe('sign-up and reset, known and unknown addresses', () => {
	it('answers a sign-up alike and writes one audit row and one letter on both paths', async () => {
		const person = { email: 'ada.voss@lakeside.test', name: 'Ada Voss', password: PASSWORD };
		const fresh = await written(() => signUp(world.database, person));
		const again = { ...person, name: 'Someone Else', password: 'a-different-passphrase' };
		const taken = await written(() => signUp(world.database, again));
		expect(fresh).toEqual({ users: 1, emailTokens: 1, audit: 1, outbox: 1 });
		expect(taken).toEqual({ users: 0, emailTokens: 0, audit: 1, outbox: 1 });
		const [confirm, notice] = await mailTo(world, person.email);
		expect(confirm.text).toContain('/verify/');
		expect(notice.subject).toBe('Someone tried to open a Rankseal account with your address');
		expect(notice.text).toContain('Hello Ada Voss');
		expect(notice.text).not.toContain('/verify/');
	});

	it('keeps the ordinary answer for a token that is no invitation', async () => {
		const taken = signUp(
			world.database,
			{ email: 'ada.voss@lakeside.test', name: 'Ada', password: PASSWORD },
			{ invitationToken: 'not-an-invitation' }
		);
		// A token that is no invitation proves nothing: the answer is the ordinary one.
		await expect(taken).resolves.toMatchObject({ invited: false });
	});

	it('writes one audit row and one letter for a reset, with or without an account', async () => {
		const known = await written(() =>
			requestPasswordReset(world.database, 'Ada.Voss@lakeside.test')
		);
		const unknown = await written(() =>
			requestPasswordReset(world.database, 'nobody@lakeside.test')
		);
		expect(known).toMatchObject({ users: 0, audit: 1, outbox: 1, emailTokens: 1 });
		expect(unknown).toMatchObject({ users: 0, audit: 1, outbox: 1, emailTokens: 0 });
		const [letter] = await mailTo(world, 'nobody@lakeside.test');
		expect(letter.subject).toBe('A Rankseal password was requested for this address');
	});
});

describe('sign-in pauses', () => {
	const client = { address: '192.0.2.7' };
	const attempt = (email: string, password: string) =>
		signInFrom(world.database, { email, password }, client).then(
			(outcome) => ({ answer: outcome.userId ? 'in' : 'no', pause: outcome.pauseSeconds }),
			(e: { retryAfterSeconds: number }) => ({ answer: 429, pause: e.retryAfterSeconds })
		);

	it('grows the pause after the free failures, refuses during it, and a success clears it', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({
			signInAccountAddress: { free: 2, cap: 10, firstDelaySeconds: 5 }
		});
		resetRateLimits();
		vi.useFakeTimers({ toFake: ['Date'] });
		const email = 'ada.voss@lakeside.test';
		const answers = [];
		for (let i = 0; i < 5; i++) {
			answers.push(await attempt(email, 'wrong-guess'));
			// A try during the pause is refused before the password is looked at, the right one too.
			answers.push(await attempt(email, PASSWORD));
			vi.setSystemTime(Date.now() + 60_000);
		}
		expect(answers).toEqual([
			{ answer: 'no', pause: null },
			{ answer: 'in', pause: null },
			{ answer: 'no', pause: null },
			{ answer: 'in', pause: null },
			{ answer: 'no', pause: null },
			{ answer: 'in', pause: null },
			{ answer: 'no', pause: null },
			{ answer: 'in', pause: null },
			{ answer: 'no', pause: null },
			{ answer: 'in', pause: null }
		]);
		// Without successes between them, failures add up and the pauses double.
		const waits = [];
		for (let i = 0; i < 2; i++) await attempt(email, 'wrong-guess');
		for (let i = 0; i < 4; i++) {
			const failed = await attempt(email, 'wrong-guess');
			const refused = await attempt(email, PASSWORD);
			expect(refused).toEqual({ answer: 429, pause: failed.pause });
			waits.push(failed.pause);
			vi.setSystemTime(Date.now() + failed.pause! * 1000);
		}
		expect(waits).toEqual([5, 10, 20, 40]);
		expect(await attempt(email, PASSWORD)).toEqual({ answer: 'in', pause: null });
		expect(await attempt(email, 'wrong-guess')).toEqual({ answer: 'no', pause: null });
	});

	it('pauses an address without an account exactly like one with an account', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({
			signInAccountAddress: { free: 1, firstDelaySeconds: 30 }
		});
		resetRateLimits();
		vi.useFakeTimers({ toFake: ['Date'] });
		const known = [];
		const unknown = [];
		for (let i = 0; i < 3; i++) {
			known.push(await attempt('ada.voss@lakeside.test', 'wrong-guess'));
			unknown.push(await attempt('no.account@lakeside.test', 'wrong-guess'));
		}
		expect(known).toEqual(unknown);
		expect(known.map((a) => a.answer)).toEqual(['no', 'no', 429]);
	});
});

describe('sign-in pauses per client address', () => {
	it('pauses one network address guessing many accounts, and leaves another address alone', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({
			signInAddress: { free: 3, firstDelaySeconds: 60 }
		});
		resetRateLimits();
		// The clock stands still, so a wait reads exactly as it was set however slow the machine.
		vi.useFakeTimers({ toFake: ['Date'] });
		const from = (address: string, i: number) =>
			signInFrom(
				world.database,
				{ email: `guess${i}@lakeside.test`, password: 'wrong-guess' },
				{ address }
			);
		const pauses = [];
		for (let i = 0; i < 4; i++) pauses.push((await from('198.51.100.4', i)).pauseSeconds);
		expect(pauses).toEqual([null, null, null, 60]);
		await expect(from('198.51.100.4', 9)).rejects.toMatchObject({
			retryAfterSeconds: 60,
			message: expect.stringMatching(/^Too many failed sign-ins from your network address\./)
		});
		expect((await from('203.0.113.8', 9)).pauseSeconds).toBeNull();
	});
});

describe('the per-recipient mail cap', () => {
	it('holds letters past the cap, keeps them listed, and sends one an admin releases', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({ mailPerRecipient: { points: 2 } });
		const target = 'flooded@lakeside.test';
		for (let i = 0; i < 4; i++) await requestPasswordReset(world.database, target);
		await requestPasswordReset(world.database, 'other@lakeside.test');
		expect(await mailTo(world, target)).toHaveLength(2);
		expect(await mailTo(world, 'other@lakeside.test')).toHaveLength(1);

		const admin = await world.database.models.User.create({
			id: 'admin-cap',
			email: 'admin.cap@lakeside.test',
			name: 'Admin',
			passwordHash: 'x',
			accountRole: 'admin',
			emailVerifiedAt: new Date()
		});
		const actor = asUser(admin.get('id') as string, 'admin');
		const held = await listOutbox(world.database, actor, 1, 'held');
		expect(held.items.map((m) => m.to)).toEqual([target, target]);
		expect(held.items[0].lastError).toMatch(/held back: this address already had 2 messages/);
		await requeueOutboxMessage(world.database, actor, held.items[0].id);
		await deliverDue(world.database, world.mailer);
		expect(await mailTo(world, target)).toHaveLength(3);
		expect((await listOutbox(world.database, actor, 1, 'held')).total).toBe(1);
	});
});
