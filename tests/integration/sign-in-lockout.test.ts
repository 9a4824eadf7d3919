/**
 * Nobody can lock the owner out (issue 16 part 3), against a real SQLite file and the real mail
 * catcher. The pause a person meets is per (account, client address); guesses from rotating
 * addresses meet an account-wide ceiling far higher, which an address the account signed in from
 * lately does not meet; a completed password reset clears every pause of the account. Time is
 * set with vitest's fake Date, never waited for. Common practice (OWASP authentication guidance,
 * from memory): throttle per account and source, never a hard lockout an attacker can trigger.
 */
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { RATE_LIMITS, resetRateLimits } from '../../src/lib/server/core/rate-limits';
import {
	requestPasswordReset,
	resetPassword,
	signUp
} from '../../src/lib/server/accounts/accounts';
import { signInFrom } from '../../src/lib/server/accounts/sign-in';
import { linkToken, mailWorld, type MailWorld } from './mail-world';

const PASSWORD = 'heron-quarry-lamplight';
const OWNER = 'owner.lund@lakeside.test';
const HOME = { address: '192.0.2.50' };

let world: MailWorld;
beforeAll(async () => {
	world = await mailWorld();
	await signUp(world.database, {
		email: OWNER,
		name: 'Owner Lund',
		password: PASSWORD
	});
});
afterAll(async () => world?.close());
beforeEach(() => {
	resetRateLimits();
	vi.useFakeTimers({ toFake: ['Date'] });
});
afterEach(() => {
	delete process.env.RANKSEAL_RATE_LIMITS;
	resetRateLimits();
	vi.useRealTimers();
});

const attempt = (password: string, client: { address: string }, email = OWNER) =>
	signInFrom(world.database, { email, password }, client).then(
		(outcome) => ({ answer: outcome.userId ? 'in' : 'no', pause: outcome.pauseSeconds }),
		(e: { retryAfterSeconds: number; message: string }) => ({
			answer: 429,
			pause: e.retryAfterSeconds,
			words: e.message
		})
	);

/** Wrong passwords for the owner's address, each from a fresh client address. */
async function rotatingGuesses(count: number, from = 0) {
	const answers = [];
	for (let i = from; i < from + count; i++)
		answers.push(await attempt(`guess-${i}`, { address: `203.0.113.${i % 250}/${i}` }));
	return answers;
}

describe('guesses from rotating addresses', () => {
	it('leave the owner signing in from their own address (the table as shipped)', async () => {
		await rotatingGuesses(25);
		expect(await attempt(PASSWORD, HOME)).toEqual({ answer: 'in', pause: null });
	});

	it('meet the account-wide ceiling, which pauses new addresses but not one the owner used', async () => {
		expect(await attempt(PASSWORD, HOME)).toEqual({ answer: 'in', pause: null });
		const ceiling = RATE_LIMITS.signInAccount;
		const answers = await rotatingGuesses(ceiling.free + 3);
		expect(answers.slice(0, ceiling.free).every((a) => a.answer === 'no')).toBe(true);
		// Past the free failures the account pauses: a new address is refused, even with the password.
		expect(answers.at(-1)).toMatchObject({ answer: 429 });
		const stranger = await attempt(PASSWORD, { address: '198.51.100.99' });
		expect(stranger).toMatchObject({
			answer: 429,
			words: expect.stringMatching(/for this account\./)
		});
		expect(await attempt(PASSWORD, HOME)).toEqual({ answer: 'in', pause: null });
	});
});

describe('the pause per account and address', () => {
	it('still pauses guessing from one address, as before', async () => {
		const rule = RATE_LIMITS.signInAccountAddress;
		const client = { address: '198.51.100.7' };
		const answers = [];
		for (let i = 0; i <= rule.free; i++) answers.push(await attempt(`wrong-${i}`, client));
		expect(answers.slice(0, rule.free).map((a) => a.pause)).toEqual(Array(rule.free).fill(null));
		expect(answers.at(-1)).toEqual({ answer: 'no', pause: rule.firstDelaySeconds });
		expect(await attempt(PASSWORD, client)).toMatchObject({
			answer: 429,
			words: expect.stringMatching(/^Too many failed sign-ins for this account from your network/)
		});
		vi.setSystemTime(Date.now() + rule.firstDelaySeconds * 1000);
		expect(await attempt(PASSWORD, client)).toEqual({ answer: 'in', pause: null });
	});

	it('is cleared, with the account-wide one, by a completed password reset', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({
			signInAccountAddress: { free: 1, firstDelaySeconds: 3000 },
			signInAccount: { free: 2, firstDelaySeconds: 3000 }
		});
		resetRateLimits();
		await attempt('wrong-a', HOME);
		await attempt('wrong-b', HOME);
		await rotatingGuesses(3, 100);
		expect(await attempt(PASSWORD, HOME)).toMatchObject({ answer: 429 });
		expect(await attempt(PASSWORD, { address: '198.51.100.1' })).toMatchObject({ answer: 429 });
		await requestPasswordReset(world.database, OWNER);
		const token = await linkToken(world, OWNER, '/reset/');
		const newPassword = 'kestrel-granite-willow';
		const reset = await resetPassword(world.database, world.lucia, token, newPassword);
		expect(reset.ok).toBe(true);
		expect(await attempt(newPassword, HOME)).toEqual({ answer: 'in', pause: null });
		expect(await attempt(newPassword, { address: '198.51.100.1' })).toEqual({
			answer: 'in',
			pause: null
		});
	});
});
