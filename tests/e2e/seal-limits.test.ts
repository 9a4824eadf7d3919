/**
 * The public /seal page's limits against the built app (issue 16), with small limits named
 * here: a look-up by ?q= or on the ID page, and a bundle upload, are counted per client address;
 * past the limit the answer is 429 with Retry-After and the words every limit uses. Nothing waits
 * for a time: the windows are longer than the test. 429 and Retry-After: RFC 6585 §4 and
 * RFC 9110 §10.2.3.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROOMY_RATE_LIMITS, startApp, type AppServer } from './server';

let app: AppServer;

beforeAll(async () => {
	const limits = {
		...JSON.parse(ROOMY_RATE_LIMITS),
		sealLookup: { points: 2 },
		sealBundle: { points: 1 }
	};
	app = await startApp({ RANKSEAL_DEMO: '0', RANKSEAL_RATE_LIMITS: JSON.stringify(limits) });
});

afterAll(async () => {
	await app?.stop();
});

const ID = '0123456789abcdef0123';

describe('/seal limits per client address', () => {
	it('answers the third look-up 429 with Retry-After, on the page and its ID page alike', async () => {
		const first = await fetch(`${app.origin}/seal?q=${ID}`);
		expect(first.status).toBe(200);
		expect(await first.text()).toMatch(/unknown|not on record|no certificate/i);
		expect((await fetch(`${app.origin}/seal/${ID}`)).status).toBe(200);
		const third = await fetch(`${app.origin}/seal/${ID}`);
		expect(third.status).toBe(429);
		expect(Number(third.headers.get('retry-after'))).toBeGreaterThan(0);
		expect(await third.text()).toMatch(
			/Too many certificate look-ups from your network address\. Try again in \d+ seconds? \(at \d\d:\d\d:\d\d UTC\)/
		);
		// The page without a look-up stays open: the upload form is always shown.
		expect((await fetch(`${app.origin}/seal`)).status).toBe(200);
	});

	it('answers the second bundle upload 429 with Retry-After beside the form', async () => {
		const send = () => {
			const form = new FormData();
			form.set('bundle', new Blob([Buffer.from('not a zip at all')]), 'bundle.zip');
			return fetch(`${app.origin}/seal?/bundle`, {
				method: 'POST',
				// A browser's own form post (no script): the page comes back with the refusal.
				headers: { origin: app.origin, accept: 'text/html' },
				body: form
			});
		};
		const first = await send();
		expect(first.status).toBe(200);
		expect(await first.text()).toMatch(/not a zip archive/);
		const second = await send();
		expect(second.status).toBe(429);
		expect(Number(second.headers.get('retry-after'))).toBeGreaterThan(0);
		expect(await second.text()).toMatch(
			/Too many bundle checks from your network address\. Try again in \d+ minutes \(at/
		);
	});
});
