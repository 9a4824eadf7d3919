/**
 * The method pages and grid uploads in Chromium at 1366 px and 390 px (issue 18): a page per
 * method reached from the claim form and the check page, its ladder equal to the family's own
 * bounds; a grid file uploaded through the claim page is read and the layout is named.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sampledCounts, states, witnessFamilies } from '../../src/lib/certify';
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

function gridFile(d: number, seed: number): string {
	const data = sampledCounts(states.isotropic(d, 0.92), [0, 1], 50_000, seed);
	const lines: string[] = [];
	for (const t of data.tables) {
		lines.push(`# basis ${t.basis}`);
		for (let a = 0; a < d; a++) lines.push([...t.counts.subarray(a * d, a * d + d)].join(';'));
	}
	return lines.join('\n') + '\n';
}

describe.each(WIDTHS)('at %i px', (width) => {
	it('the claim form and the check page link to the method pages', async () => {
		await session.signedInAs('lead');
		await session.visit('/claims/new', 'claim-new', width);
		expect(await page.getAttribute('[data-testid=methods-link]', 'href')).toBe('/methods');
		const claim = session.claims[0];
		await session.visit(`/claims/${claim.id}/checks/${claim.latestCheck!.id}`, 'check', width);
		expect(await page.getAttribute('[data-testid=method-link]', 'href')).toBe(
			`/methods/${claim.method}`
		);
	});

	it("a method's page gives assumptions, statistic, the family's own ladder, sources, when to prefer it", async () => {
		await page.context().clearCookies();
		for (const [id, family] of Object.entries(witnessFamilies)) {
			await session.visit(`/methods/${id}?d=7`, `method-${id}`, width);
			expect(await page.textContent('[data-testid=method-reference]')).toBe(family.reference);
			expect(await page.textContent('[data-testid=method-prefer]')).toBe(family.preferWhen);
			const assumes = (await page.textContent('[data-testid=method-assumes]'))!;
			for (const line of family.assumes ?? []) expect(assumes).toContain(line);
			const bases = family.defaultBases([0, 1, 2, 3, 4, 5, 6, 7], 7);
			const shown = await page.$$eval(
				'[data-testid=method-ladder] tbody tr td:last-child',
				(cells) => cells.map((c) => Number(c.textContent))
			);
			const expected = family.bounds(7, bases);
			expect(shown).toHaveLength(expected.length);
			shown.forEach((v, i) => expect(v).toBeCloseTo(expected[i], 5));
			const wide = await page.evaluate(() => document.documentElement.scrollWidth);
			expect(wide).toBeLessThanOrEqual(width);
		}
	});
});

describe('a grid upload in the browser', () => {
	it('is read, and the page says how', async () => {
		await session.signedInAs('lead');
		// A demo steering claim: d = 7 on bases 0 and 1.
		const claim = session.claims.find((c) => c.method === 'steering-2mub')!;
		await session.visit(`/claims/${claim.id}`, 'claim-before-grid', 390);
		await page.setInputFiles('input[name=counts]', {
			name: 'tb7-grids.csv',
			mimeType: 'text/csv',
			buffer: Buffer.from(gridFile(7, 4711))
		});
		await page.click('form[action="?/upload"] button');
		await page.locator('[data-testid=read-as]').waitFor();
		expect(await page.textContent('[data-testid=read-as]')).toBe(
			'The file was read as 2 grids of 7 × 7, semicolon-separated.'
		);
	});
});
