/**
 * The rate-limit table and its two kinds of limit. Time is set, never waited for: the limiter
 * (rate-limiter-flexible's memory store) reads Date.now(), which vitest's fake clock moves.
 * Retry-After is whole seconds (RFC 9110 §10.2.3); 429 with it is RFC 6585 §4. Doubling pauses
 * after a few free failures is common practice (exponential back-off).
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import {
	LadderLimit,
	RATE_LIMITS,
	WindowLimit,
	rateLimitRules,
	retryWords,
	takeOrRefuse,
	resetRateLimits
} from '../../src/lib/server/core/rate-limits';
import { RateLimitedError } from '../../src/lib/server/core/errors';

const START = new Date('2026-03-01T09:00:00Z');

beforeEach(() => {
	vi.useFakeTimers({ toFake: ['Date'] });
	vi.setSystemTime(START);
});
afterEach(() => vi.useRealTimers());

const later = (seconds: number) => vi.setSystemTime(Date.now() + seconds * 1000);

describe('a ladder of failures', () => {
	const rule = {
		kind: 'ladder',
		free: 3,
		cap: 8,
		windowSeconds: 3600,
		firstDelaySeconds: 2
	} as const;

	it('lets the free failures through, then makes each next try wait twice as long', async () => {
		const ladder = new LadderLimit(rule);
		const answers: (number | null)[] = [];
		for (let i = 0; i < 3; i++) answers.push(await ladder.fail('a@x.test'));
		expect(answers).toEqual([null, null, null]);
		expect(await ladder.check('a@x.test')).toBeNull();
		const waits: number[] = [];
		for (let failure = 4; failure < 8; failure++) {
			expect(await ladder.check('a@x.test')).toBeNull();
			const pause = (await ladder.fail('a@x.test'))!;
			// Refused at once, and still one second before the pause ends; allowed when it ends.
			expect(await ladder.check('a@x.test')).toBe(pause);
			later(pause - 1);
			expect(await ladder.check('a@x.test')).toBe(1);
			later(1);
			waits.push(pause);
		}
		expect(waits).toEqual([2, 4, 8, 16]);
	});

	it('refuses every try past the cap until the window ends', async () => {
		const ladder = new LadderLimit(rule);
		for (let i = 0; i < 7; i++) {
			await ladder.fail('b@x.test');
			later(60);
		}
		// The eighth failure reaches the cap: the wait is the rest of the hour (7 × 60 s gone).
		expect(await ladder.fail('b@x.test')).toBe(3600 - 7 * 60);
		later(600);
		expect(await ladder.check('b@x.test')).toBe(3600 - 7 * 60 - 600);
		later(3600 - 7 * 60 - 600);
		expect(await ladder.check('b@x.test')).toBeNull();
		expect(await ladder.fail('b@x.test')).toBeNull();
	});

	it('forgets an account on clear(), and keeps keys apart', async () => {
		const ladder = new LadderLimit({ ...rule, free: 0 });
		expect(await ladder.fail('c@x.test')).toBe(2);
		expect(await ladder.check('c@x.test')).toBe(2);
		expect(await ladder.check('d@x.test')).toBeNull();
		await ladder.clear('c@x.test');
		expect(await ladder.check('c@x.test')).toBeNull();
		expect(await ladder.fail('c@x.test')).toBe(2);
	});
});

describe('a window of attempts', () => {
	it('allows the points, refuses the rest until the window ends, then allows again', async () => {
		const window = new WindowLimit({ kind: 'window', points: 3, windowSeconds: 600 });
		const answers = [];
		for (let i = 0; i < 5; i++) {
			answers.push(await window.take('10.0.0.1'));
			later(10);
		}
		expect(answers).toEqual([null, null, null, 600 - 30, 600 - 40]);
		expect(await window.take('10.0.0.2')).toBeNull();
		later(600 - 50);
		expect(await window.take('10.0.0.1')).toBeNull();
	});

	it('throws the rate-limited error with the words and the wait', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({ signUp: { points: 1, windowSeconds: 90 } });
		resetRateLimits();
		try {
			await takeOrRefuse('signUp', '10.0.0.9', 'Too many sign-ups.');
			const refused = takeOrRefuse('signUp', '10.0.0.9', 'Too many sign-ups.');
			await expect(refused).rejects.toBeInstanceOf(RateLimitedError);
			await expect(refused).rejects.toMatchObject({
				retryAfterSeconds: 90,
				message: 'Too many sign-ups. Try again in 90 seconds (at 09:01:30 UTC).'
			});
		} finally {
			delete process.env.RANKSEAL_RATE_LIMITS;
			resetRateLimits();
		}
	});
});

describe('the table and its overrides', () => {
	it('merges RANKSEAL_RATE_LIMITS field by field', () => {
		const rules = rateLimitRules('{"signInAccount":{"free":2},"reviewUse":{"points":99999}}');
		expect(rules.signInAccount).toEqual({ ...RATE_LIMITS.signInAccount, free: 2 });
		expect(rules.reviewUse).toEqual({ ...RATE_LIMITS.reviewUse, points: 99999 });
		expect(rules.signUp).toEqual(RATE_LIMITS.signUp);
		expect(rateLimitRules('')).toEqual(RATE_LIMITS);
	});

	it('names the field of a bad override', () => {
		expect(() => rateLimitRules('{"signInAccount":{"free":-1}}')).toThrow(
			/RANKSEAL_RATE_LIMITS: signInAccount\.free/
		);
		expect(() => rateLimitRules('{"signInAcount":{}}')).toThrow(/RANKSEAL_RATE_LIMITS/);
		expect(() => rateLimitRules('{"signUp":{"free":2}}')).toThrow(/RANKSEAL_RATE_LIMITS: signUp/);
	});

	it('says when to retry in words', () => {
		expect(retryWords(1, START)).toBe('in 1 second (at 09:00:01 UTC)');
		expect(retryWords(300, START)).toBe('in 5 minutes (at 09:05:00 UTC)');
		expect(retryWords(3 * 3600, START)).toBe('in 3 hours (at 12:00:00 UTC)');
	});
});
