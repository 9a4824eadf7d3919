/**
 * The public /plan page under its rate limit: a refused plan is the site's error page with status
 * 429 and Retry-After (RFC 9110 §10.2.3; RFC 6585 §4 for 429), as /seal's look-ups answer, not a
 * 200 page carrying the refusal as a form error.
 */
import { isHttpError } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';

// One simulated plan per address, so that the second question is refused.
process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({ planSimulations: { points: 1 } });
const planPage = await import('../../src/routes/plan/+page.server');
const { resetRateLimits } = await import('../../src/lib/server/core/rate-limits');

function planEvent(address: string, query: string) {
	const headers: Record<string, string> = {};
	const url = new URL(`http://localhost/plan?${query}`);
	const event = {
		url,
		request: new Request(url),
		params: {},
		locals: {},
		getClientAddress: () => address,
		setHeaders: (more: Record<string, string>) => Object.assign(headers, more)
	};
	return { event: event as never, headers };
}

describe('the /plan page under its rate limit', () => {
	it('answers a refused plan with 429 and Retry-After, and another address is not held up', async () => {
		resetRateLimits();
		const question = 'method=mub-correlation&dimension=3&schmidtNumber=2&simulate=requested';
		const first = planEvent('203.0.113.9', `${question}&visibility=0.9`);
		expect(await planPage.load(first.event)).toMatchObject({
			plan: { alternatives: expect.any(Array) },
			errors: {}
		});
		const second = planEvent('203.0.113.9', `${question}&visibility=0.8`);
		const refused = await (planPage.load(second.event) as Promise<unknown>).catch((e) => e);
		expect(isHttpError(refused) && refused.status).toBe(429);
		expect(isHttpError(refused) && refused.body.message).toMatch(
			/^Too many plans with simulated counts from this address\. Try again/
		);
		expect(second.headers['retry-after']).toMatch(/^\d+$/);
		const other = planEvent('203.0.113.10', `${question}&visibility=0.8`);
		expect(await planPage.load(other.event)).toMatchObject({
			plan: { alternatives: expect.any(Array) },
			errors: {}
		});
	});
});
