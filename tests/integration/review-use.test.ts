/**
 * Review-link use under the limits, against a real SQLite file: a link has a ceiling of uses in a
 * window, and links that do not open pause the client address with growing waits. No waiting:
 * the limits are set small and the answers are counted. 429 with Retry-After: RFC 6585 §4.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { resetRateLimits } from '../../src/lib/server/core/rate-limits';
import { RateLimitedError } from '../../src/lib/server/core/errors';
import { createReviewLink } from '../../src/lib/server/review/review-links';
import { refereeFor } from '../../src/lib/server/review/review-use';
import { shareClaim } from '../../src/lib/server/review/shares';
import { asUser } from './actors';
import { reviewWorld, type ReviewWorld } from './review-world';

// Safety limits for bundling and a real check on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let w: ReviewWorld;
let token: string;
const use = { method: 'GET', path: '/api/v1/review/test' };

beforeAll(async () => {
	w = await reviewWorld();
	const { database } = w.mail;
	await shareClaim(database, asUser(w.author), w.claimId, {
		email: w.editorEmail,
		journal: 'Journal of Invented Optics',
		manuscript: 'JIO-2026-010'
	});
	const link = await createReviewLink(database, asUser(w.editor, 'editor'), w.claimId);
	token = new URL(link.url).pathname.split('/').at(-1)!;
});
afterAll(async () => w?.close());
afterEach(() => {
	vi.useRealTimers();
	delete process.env.RANKSEAL_RATE_LIMITS;
	resetRateLimits();
});

/** What each use answered: the referee's claim, 'closed' (404) or 429 with its wait. */
const answer = async (t: string, address: string) => {
	const found = await refereeFor(w.mail.database, t, use, { address });
	if (found instanceof RateLimitedError) return `429 after ${found.retryAfterSeconds} s`;
	return found ? found.claimId : 'closed';
};

describe('review-link use', () => {
	it('serves a link up to its ceiling in the window, then answers 429 until it ends', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({
			reviewUse: { points: 3, windowSeconds: 60 }
		});
		resetRateLimits();
		const answers = [];
		// From different addresses: the ceiling belongs to the link, not to the client.
		for (let i = 0; i < 5; i++) answers.push(await answer(token, `192.0.2.${i}`));
		expect(answers.slice(0, 3)).toEqual([w.claimId, w.claimId, w.claimId]);
		expect(answers[3]).toMatch(/^429 after \d+ s$/);
		expect(Number(answers[3].split(' ')[2])).toBeLessThanOrEqual(60);
	});

	it('pauses an address that tries links that do not open, with growing waits', async () => {
		process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({
			reviewRefused: { free: 2, firstDelaySeconds: 30 }
		});
		resetRateLimits();
		// The clock stands still, so a wait reads exactly as it was set however slow the machine.
		vi.useFakeTimers({ toFake: ['Date'] });
		const guesses = [];
		for (let i = 0; i < 4; i++) guesses.push(await answer(`rvw_guess${i}`, '198.51.100.9'));
		expect(guesses).toEqual(['closed', 'closed', 'closed', '429 after 30 s']);
		// The real link from that address waits too; another address is not affected.
		expect(await answer(token, '198.51.100.9')).toBe('429 after 30 s');
		expect(await answer(token, '203.0.113.1')).toBe(w.claimId);
	});
});
