/**
 * One claim filter on two pages (issue 17): the claim list and the archive show the same fields
 * (Search, State, Method) from one component; typing in the list's search narrows it without a
 * reload, and the archive finds the same claims for the same text.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openPages, type PagesSession } from './pages-session';

let session: PagesSession;
let page: Page;
let origin = '';

beforeAll(async () => {
	session = await openPages();
	({ page } = session);
	origin = session.app.origin;
});
afterAll(async () => {
	await session?.close();
});

const labels = (testid: string) =>
	page.$$eval(`[data-testid=${testid}] label`, (nodes) =>
		nodes.map((n) => n.childNodes[0]?.textContent?.trim() ?? '')
	);
const shown = (selector: string, attribute: string) =>
	page.$$eval(selector, (nodes, a) => nodes.map((n) => n.getAttribute(a)!).sort(), attribute);

describe('the claim filter', () => {
	it('narrows the list as one types, and the archive finds the same claims', async () => {
		await session.signedInAs('lead');
		await page.goto(`${origin}/claims`);
		expect(await labels('claim-filters')).toEqual(['Search', 'State', 'Method']);
		const all = await shown('[data-testid=claims-table] tbody tr', 'data-claim');
		await page.locator('[data-testid=claim-filters] input[name=q]').fill('time-bin');
		await page.waitForURL(/\/claims\?q=time-bin/);
		await page.waitForFunction(
			(n) => document.querySelectorAll('[data-testid=claims-table] tbody tr').length < n,
			all.length
		);
		const listed = await shown('[data-testid=claims-table] tbody tr', 'data-claim');
		expect(listed.length).toBeGreaterThan(0);

		await page.goto(`${origin}/archive?q=time-bin`);
		expect((await labels('archive-filters')).slice(-6, -3)).toEqual(['Search', 'State', 'Method']);
		expect(await shown('[data-testid=archive-claim]', 'data-claim')).toEqual(listed);
	});
});
