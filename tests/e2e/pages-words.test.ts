/**
 * Finding one's way, and the words of a result (issue 7 §5): a skip link; sortable headers that
 * say their sort; sign-out in the header; our own 404 and 403 pages; pager words at the edges;
 * pages meant for editors and for users in no group; only reachable states in the filter; the
 * statistic, its maximum, the coincidences and the trusted side; keys for scripts still work.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openPages, type ClaimItem, type PagesSession } from './pages-session';
import { DEMO_CLAIMS } from '../../src/lib/server/demo/scenario';

let session: PagesSession;
let page: Page;
let origin = '';
let claims: ClaimItem[] = [];
const signedInAs = (key: string) => session.signedInAs(key);

beforeAll(async () => {
	session = await openPages();
	({ page, claims } = session);
	origin = session.app.origin;
});
afterAll(async () => {
	await session?.close();
});

describe('the result in words', () => {
	it('names the statistic, its maximum and the coincidences; says which side is trusted', async () => {
		await signedInAs('lead');
		const symbols: Record<string, RegExp> = {
			'mub-correlation': /^S, the correlation sum .* \(at most \d+\)$/,
			'steering-2mub': /^W, the steering sum .* \(at most 2\)$/,
			'fidelity-two-basis': /^F̃, the lower bound on the fidelity .* \(at most 1\)$/
		};
		for (const claim of claims) {
			await page.goto(`${origin}/claims/${claim.id}/checks/${claim.latestCheck!.id}`);
			const name = (await page.textContent('[data-testid=statistic-name]'))!.replace(/\s+/g, ' ');
			expect(name.trim()).toMatch(symbols[claim.method]);
			expect(await page.textContent('[data-testid=coincidences]')).toMatch(/^[\d,]+$/);
			// The engine's own note on how the lower bound was made, word for word.
			const check = await fetch(`${origin}/api/v1/checks/${claim.latestCheck!.id}`, {
				headers: { cookie: `rankseal_session=${session.world.sessions.lead}` }
			});
			const { result } = await check.json();
			expect(result.statistic.boundNote.length).toBeGreaterThan(20);
			expect((await page.textContent('[data-testid=bound-note]'))?.trim()).toBe(
				result.statistic.boundNote
			);
			const trust = (await page.textContent('[data-testid=trust]'))!;
			if (claim.method === 'steering-2mub') {
				expect(trust).toContain('side B trusted, side A untrusted');
				await expect(page.textContent('[data-testid=cautions]')).resolves.toContain(
					'Side B trusted, side A untrusted'
				);
			} else expect(trust).toContain('both sides trusted');
			const text = (await page.textContent('main'))!;
			for (const internal of ['sufficient-totals', "Point value's rung", 'Copper rungs'])
				expect(text).not.toContain(internal);
		}
	});
});

describe('finding one’s way', () => {
	it('offers a skip link first, which moves focus to the content', async () => {
		await signedInAs('lead');
		await page.setViewportSize({ width: 1366, height: 900 });
		await page.goto(`${origin}/claims`);
		await page.keyboard.press('Tab');
		expect(await page.evaluate(() => document.activeElement?.textContent?.trim())).toBe(
			'Skip to the content'
		);
		await page.keyboard.press('Enter');
		expect(await page.evaluate(() => document.activeElement?.id)).toBe('main');
	});

	it('shows which headers sort, and tells screen readers the sort state', async () => {
		await page.goto(`${origin}/claims`);
		const sortable = page.locator('[data-testid=claims-table] th a[data-sortable]');
		expect(await sortable.count()).toBe(5);
		for (const text of await sortable.allTextContents()) expect(text).toMatch(/⇅|▲|▼/);
		expect(await page.locator('th[aria-sort]').count()).toBe(0);
		await page.click('th[data-column=title] a');
		await page.waitForSelector('th[data-column=title][aria-sort=ascending]', { timeout: 0 });
		await page.click('th[data-column=title] a');
		await page.waitForSelector('th[data-column=title][aria-sort=descending]', { timeout: 0 });
		expect(await page.locator('th[aria-sort]').count()).toBe(1);
	});

	it('signs out from the page header, and the session is gone', async () => {
		await signedInAs('lead-2');
		await page.goto(`${origin}${session.groupUrl}`);
		await Promise.all([
			page.waitForURL(/\/login/),
			page.click('[data-testid=header-sign-out] button')
		]);
		const after = await fetch(`${origin}/claims`, {
			headers: { cookie: `rankseal_session=${session.world.sessions['lead-2']}` },
			redirect: 'manual'
		});
		expect(after.status).toBe(303);
		expect(after.headers.get('location')).toMatch(/^\/login/);
	});

	it('answers 404 and 403 with our layout, a title and a way back', async () => {
		await signedInAs('lead');
		const missing = await page.goto(`${origin}/claims/no-such-claim`);
		expect(missing!.status()).toBe(404);
		expect(await page.title()).toBe('Nothing here — Rankseal');
		expect(await page.locator('a[aria-label="Rankseal, home"]').count()).toBe(1);
		expect(await page.getAttribute('[data-testid=error-back]', 'href')).toBe('/claims');
		await signedInAs('editor');
		const closed = await page.goto(`${origin}/admin/users`);
		expect(closed!.status()).toBe(403);
		expect(await page.title()).toBe('This page is not open to you — Rankseal');
		expect(await page.getAttribute('[data-testid=error-page]', 'data-status')).toBe('403');
	});

	it('reads correctly past the last page and on an empty list', async () => {
		await signedInAs('lead');
		await page.goto(`${origin}/claims?pageSize=1&page=99`);
		const status = (await page.textContent('[data-testid=pager-status]'))!;
		expect(status).toBe(
			`Page 99 is past the end: ${claims.length} claims fill ${claims.length} pages`
		);
		expect(await page.getAttribute('[data-testid=pager-last]', 'href')).toContain(
			`page=${claims.length}`
		);
		await page.goto(`${origin}/claims?pageSize=1&page=2`);
		expect(await page.textContent('[data-testid=pager-status]')).toBe(
			`2 of ${claims.length} claims, page 2 of ${claims.length}`
		);
		await signedInAs('loner');
		await page.goto(`${origin}/claims`);
		expect(await page.locator('[data-testid=pager]').count()).toBe(0);
		expect(await page.locator('[data-testid=new-claim]').count()).toBe(0);
		expect(await page.textContent('[data-testid=no-claims]')).toContain('not in a research group');
	});

	it('tells someone in no group why there is no archive, on the page and in the API alike', async () => {
		await signedInAs('loner');
		const response = await page.goto(`${origin}/archive`);
		expect(response!.status()).toBe(403);
		const why = 'You belong to no group, so there is no group archive to list.';
		expect(await page.textContent('[data-testid=error-page]')).toContain(why);
		expect(await page.locator('nav a[href="/archive"]').count()).toBe(0);
		const api = await fetch(`${origin}/api/v1/archive`, {
			headers: { cookie: `rankseal_session=${session.world.sessions.loner}` }
		});
		expect(api.status).toBe(403);
		expect((await api.json()).error).toMatchObject({
			code: 'forbidden',
			message: expect.stringContaining(why)
		});
	});

	it('gives an editor pages meant for an editor', async () => {
		await signedInAs('editor');
		await page.goto(`${origin}/claims`);
		expect(await page.textContent('h1')).toBe('Claims shared with you');
		const text = (await page.textContent('main'))!;
		// The demo shares its first claim with the editor (issue 9), and only that one.
		expect(text).toContain(DEMO_CLAIMS[0].title);
		expect(text).not.toContain(DEMO_CLAIMS[1].title);
		expect(text).not.toMatch(/make the first|start a group/i);
		expect(await page.locator('nav a[href="/group"]').count()).toBe(0);
		await page.goto(`${origin}/group`);
		expect(await page.textContent('main')).not.toMatch(/start a group|start another group/i);
	});

	it('offers only the claim states some action can reach now', async () => {
		await signedInAs('lead');
		await page.goto(`${origin}/claims`);
		const states = await page.$$eval('select[name=state] option', (options) =>
			options.map((o) => (o as HTMLOptionElement).value)
		);
		// Withdrawing a claim (claim-withdraw.ts) reaches 'withdrawn'; nothing makes a claim superseded.
		expect(states).toEqual(['', 'draft', 'checked', 'certified', 'shared', 'withdrawn']);
	});
});

describe('keys for scripts and the mail view keep what they could do', () => {
	it('makes a key, shows it once, and withdraws it', async () => {
		await signedInAs('author1');
		await page.goto(`${origin}/settings/tokens`);
		await page.fill('form[action="?/create"] input[name=name]', 'night upload, lab PC 3');
		await page.click('form[action="?/create"] button');
		const secret = (await page.textContent('[data-testid=token-secret]'))!;
		expect(secret).toMatch(/^rks_\S{20,}$/);
		const works = await fetch(`${origin}/api/v1/claims`, {
			headers: { authorization: `Bearer ${secret}` }
		});
		expect(works.status).toBe(200);
		const item = page.locator('[data-testid=tokens] li', { hasText: 'night upload, lab PC 3' });
		await item.locator('button').click();
		await page.waitForSelector('[data-testid=tokens] li:has-text("withdrawn")', { timeout: 0 });
		const refused = await fetch(`${origin}/api/v1/claims`, {
			headers: { authorization: `Bearer ${secret}` }
		});
		expect(refused.status).toBe(401);
	});
});
