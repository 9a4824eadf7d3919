/**
 * Every page a new user meets, in Chromium at a laptop's 1366 px and a phone's 390 px (issue 7
 * §5): each answers itself (not an error page), nothing overflows sideways, the verdict,
 * certified, Remove and Set controls and the DOI states stay on screen, and chart labels stay at
 * least 11 px on a phone.
 */
import type { Page, Response } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openPages, type PagesSession } from './pages-session';

let session: PagesSession;
let page: Page;
const WIDTHS = [1366, 390] as const;

beforeAll(async () => {
	session = await openPages();
	page = session.page;
});
afterAll(async () => {
	await session?.close();
});

/** Elements sticking out of the viewport sideways (scrolling boxes and hidden text excepted). */
async function overflow(): Promise<{ scrollWidth: number; width: number; out: string[] }> {
	return page.evaluate(() => {
		const width = document.documentElement.clientWidth;
		const out = [...document.querySelectorAll('body *')]
			.filter((el) => {
				if (el.closest('.overflow-x-auto, pre, .sr-only, svg')) return false;
				const box = el.getBoundingClientRect();
				return box.width > 0 && (box.right > width + 0.5 || box.left < -0.5);
			})
			.map((el) => `${el.tagName} "${(el.textContent ?? '').trim().slice(0, 40)}"`);
		return { scrollWidth: document.documentElement.scrollWidth, width, out };
	});
}

/** Every element matching `selector` lies fully within the viewport's width. */
async function allOnScreen(selector: string): Promise<string[]> {
	return page.$$eval(selector, (els) => {
		const width = document.documentElement.clientWidth;
		return els
			.filter((el) => {
				const box = el.getBoundingClientRect();
				return box.width === 0 || box.left < 0 || box.right > width;
			})
			.map((el) => (el.textContent ?? '').trim() || el.tagName);
	});
}

describe('every page fits a laptop and a phone', () => {
	const pages: [string, string, () => string][] = [
		['lead', 'landing', () => '/'],
		['lead', 'claims', () => '/claims'],
		['lead', 'claim', () => `/claims/${session.claims[0].id}`],
		[
			'lead',
			'check',
			() => `/claims/${session.claims[0].id}/checks/${session.claims[0].latestCheck!.id}`
		],
		['lead', 'group', () => session.groupUrl],
		['lead', 'tokens', () => '/settings/tokens'],
		['lead', 'account', () => '/account'],
		['admin', 'users', () => '/admin/users'],
		['admin', 'outbox', () => '/admin/outbox'],
		['admin', 'dois', () => '/admin/dois'],
		['editor', 'editor-claims', () => '/claims'],
		['loner', 'loner-claims', () => '/claims'],
		['lead', 'not-found', () => '/claims/no-such-claim']
	];
	for (const width of WIDTHS) {
		it.each(pages)(`as %s, %s at ${width} px`, async (who, name, url) => {
			await session.signedInAs(who);
			const response = (await session.visit(url(), name, width)) as Response;
			// The page itself, not an error page that happens to fit.
			expect(response.status()).toBe(name === 'not-found' ? 404 : 200);
			const { scrollWidth, width: shown, out } = await overflow();
			expect(out).toEqual([]);
			expect(scrollWidth).toBeLessThanOrEqual(shown);
		});
	}

	it('keeps the claims list’s certified and verdict columns, the check list’s verdicts, Remove, Set and DOI states on a phone', async () => {
		await session.signedInAs('lead');
		await session.visit('/claims', 'claims', 390);
		expect(await page.locator('[data-testid=claims-table] [data-verdict]').count()).toBe(
			session.claims.length
		);
		expect(
			await allOnScreen('th[data-column=certified], th[data-column=verdict], [data-verdict]')
		).toEqual([]);
		await session.visit(`/claims/${session.claims[0].id}`, 'claim', 390);
		expect(await page.locator('[data-testid=checks] [data-verdict]').count()).toBeGreaterThan(0);
		expect(await allOnScreen('[data-testid=checks] [data-verdict]')).toEqual([]);
		await session.visit(session.groupUrl, 'group', 390);
		expect(await page.locator('[data-testid=members] button').count()).toBeGreaterThan(2);
		expect(await allOnScreen('[data-testid=members] button')).toEqual([]);
		await session.signedInAs('admin');
		await session.visit('/admin/users', 'users', 390);
		expect(await page.locator('[data-testid=users] button').count()).toBeGreaterThan(2);
		expect(await allOnScreen('[data-testid=users] button, [data-testid=users] select')).toEqual([]);
		await session.visit('/admin/dois', 'dois', 390);
		expect(await page.locator('[data-testid=dois] [data-status]').count()).toBeGreaterThan(0);
		expect(await allOnScreen('[data-testid=dois] [data-status]')).toEqual([]);
	});

	it('draws chart labels at 11 px or more on a phone', async () => {
		await session.signedInAs('lead');
		for (const claim of session.claims) {
			await session.visit(
				`/claims/${claim.id}/checks/${claim.latestCheck!.id}`,
				`check-${claim.method}`,
				390
			);
			const sizes = await page.$$eval(
				'[data-testid=ladder-chart] text, [data-testid=visibility-chart] text',
				(texts) =>
					texts.map((t) => {
						// The scale of the text's own transform, rotation included (a rotated axis label).
						const m = (t as SVGGraphicsElement).getScreenCTM()!;
						return parseFloat(getComputedStyle(t).fontSize) * Math.hypot(m.a, m.b);
					})
			);
			expect(sizes.length).toBeGreaterThan(5);
			expect(Math.min(...sizes)).toBeGreaterThanOrEqual(11);
		}
	});
});
