/**
 * The Content-Security-Policy in a real Chromium (issue 10): every kind of page — the landing
 * page's live check, claims, checks with their charts, certificates, sharing, the editor's and
 * the referee's pages, the seal pages, the admin's outbox with an HTML mail — loads and works
 * with no violation reported, and the policy does stop an inline script (so the watch works).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openPages, type PagesSession } from './pages-session';

let session: PagesSession;
let page: Page;
let origin = '';
/** A demo certificate's id, found on its claim's page. */
let certificateId = '';
/** Every violation Chromium reported, in any frame, with the page it happened on. */
const violations: string[] = [];

/** Records violations as the page sees them (the event) and as Chromium logs them. */
function watch(target: Page) {
	target.on('console', (message) => {
		if (/Content Security Policy|Refused to/i.test(message.text()))
			violations.push(`${target.url()}: ${message.text()}`);
	});
	target.on('pageerror', (error) =>
		violations.push(`${target.url()}: page error ${error.message}`)
	);
}

/** The first link's path on the current page matching a CSS selector. */
async function hrefOf(selector: string): Promise<string> {
	const links = page.locator(selector);
	expect(await links.count(), selector).toBeGreaterThan(0);
	return new URL((await links.first().getAttribute('href'))!, origin).pathname;
}

/** Opens the page, waits for `ready` (a state, not a time) and returns what went wrong. */
async function visit(url: string, ready = 'main'): Promise<string[]> {
	violations.length = 0;
	const response = await page.goto(origin + url);
	expect(response?.status(), url).toBeLessThan(400);
	await page.waitForSelector(ready, { timeout: 0 });
	const caught = await page.evaluate(() => (window as { cspSeen?: string[] }).cspSeen ?? []);
	return [...violations, ...caught];
}

beforeAll(async () => {
	session = await openPages();
	page = session.page;
	origin = session.app.origin;
	// In every document before its own scripts: the standard event for a blocked load or script.
	await page.context().addInitScript(() => {
		const seen: string[] = [];
		(window as { cspSeen?: string[] }).cspSeen = seen;
		document.addEventListener('securitypolicyviolation', (event) =>
			seen.push(`${event.violatedDirective} blocked ${event.blockedURI || 'inline'}`)
		);
	});
	watch(page);
});
afterAll(async () => {
	await session?.close();
});

describe('the Content-Security-Policy in a browser', () => {
	it('stops an inline script, and the watch sees it', async () => {
		await visit('/login', 'form');
		const ran = await page.evaluate(async () => {
			const script = document.createElement('script');
			script.textContent = 'window.inlineRan = true;';
			document.body.append(script);
			await new Promise((settled) => requestAnimationFrame(settled));
			return (window as { inlineRan?: boolean }).inlineRan ?? false;
		});
		expect(ran).toBe(false);
		const caught = await page.evaluate(() => (window as { cspSeen?: string[] }).cspSeen ?? []);
		expect(caught.join('\n')).toMatch(/script-src/);
	});

	it('runs the landing page’s live check with no violation', async () => {
		await session.signedInAs('lead');
		const result =
			'[data-testid="result"][data-running="false"] [data-testid="certified-schmidt-number"]';
		expect(await visit('/', result)).toEqual([]);
	});

	it('shows the signed-in pages, charts and certificates with no violation', async () => {
		await session.signedInAs('lead');
		const claim = session.claims[0];
		const pages: [string, string?][] = [
			['/claims'],
			['/claims/new', 'form'],
			[`/claims/${claim.id}`],
			[`/claims/${claim.id}/checks/${claim.latestCheck!.id}`, 'svg'],
			[`/claims/${claim.id}/sharing`],
			['/archive'],
			['/group'],
			[session.groupUrl],
			['/account'],
			['/settings/tokens']
		];
		for (const [url, ready] of pages) expect(await visit(url, ready), url).toEqual([]);
		for (const item of session.claims) {
			await visit(`/claims/${item.id}`);
			if ((await page.locator('a[href*="/certificates/"]').count()) === 0) continue;
			const certificate = await hrefOf('a[href*="/certificates/"]');
			expect(await visit(certificate), certificate).toEqual([]);
			certificateId = certificate.split('/').at(-1)!;
			return;
		}
		throw new Error('no demo claim has a certificate page to visit');
	});

	it('shows the seal pages, the editor’s and the referee’s pages with no violation', async () => {
		await session.signedInAs('lead');
		expect(await visit('/seal')).toEqual([]);
		expect(await visit('/plan', 'form')).toEqual([]);
		const question = 'method=steering-2mub&dimension=4&schmidtNumber=4&visibility=0.97';
		expect(await visit(`/plan?${question}`, '[data-testid="plan-curve"]')).toEqual([]);
		expect(certificateId).not.toBe('');
		expect(await visit(`/seal/${certificateId}`)).toEqual([]);
		await session.signedInAs('editor');
		expect(await visit('/editor')).toEqual([]);
		await page.context().clearCookies();
		const link = readFileSync(path.join(session.world.dataDir, 'demo', 'review-link.txt'), 'utf8');
		const review = new URL(link.trim()).pathname;
		expect(await visit(review)).toEqual([]);
		expect(await visit('/login', 'form')).toEqual([]);
		expect(await visit('/signup', 'form')).toEqual([]);
		// The method pages (issue 18), public like the seal pages.
		expect(await visit('/methods')).toEqual([]);
		expect(await visit('/methods/steering-2mub?d=7', 'table')).toEqual([]);
	});

	it('shows the admin pages and an HTML mail sandboxed, with no violation', async () => {
		await session.signedInAs('admin');
		expect(await visit('/admin/users')).toEqual([]);
		expect(await visit('/admin/outbox')).toEqual([]);
		const mail = await hrefOf('a[href^="/admin/outbox/"]');
		expect(await visit(mail, 'iframe'), mail).toEqual([]);
		// No scripts, forms or top navigation in the mail; the page's policy covers its srcdoc too.
		expect(await page.getAttribute('iframe', 'sandbox')).toBe('');
	});
});
