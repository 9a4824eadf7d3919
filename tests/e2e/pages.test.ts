/**
 * What a new user meets, in Chromium at a laptop's 1366 px and a phone's 390 px (issue 7 §5): no
 * page overflows and the verdict, certified and Remove controls stay on screen; chart labels
 * stay at least 11 px; a skip link; sortable headers that say their sort; sign-out in the header;
 * our own 404 and 403 pages; pager words at the edges; pages meant for editors and for users in
 * no group; and the words of the result (statistic, maximum, coincidences, trusted side).
 */
import { mkdirSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, type TestBrowser } from './browser';
import { seedPagesWorld, type PagesWorld } from './pages-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: PagesWorld;
let browser: TestBrowser;
let page: Page;
// Set RANKSEAL_KEEP_SCREENSHOTS=/some/folder to look at every page afterwards.
const shots =
	process.env.RANKSEAL_KEEP_SCREENSHOTS ?? mkdtempSync(path.join(tmpdir(), 'rs-pages-'));
mkdirSync(shots, { recursive: true });

interface ClaimItem {
	id: string;
	method: string;
	latestCheck: { id: string } | null;
}
let claims: ClaimItem[] = [];
let groupUrl = '';

const WIDTHS = [1366, 390] as const;

async function signedInAs(key: string) {
	await browser.context.clearCookies();
	await browser.context.addCookies([
		{ name: 'rankseal_session', value: world.sessions[key], url: app.origin }
	]);
}

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

async function visit(url: string, shot: string, width: number) {
	await page.setViewportSize({ width, height: 900 });
	const response = await page.goto(`${app.origin}${url}`);
	await page.screenshot({ path: path.join(shots, `${shot}-${width}.png`), fullPage: true });
	return response;
}

beforeAll(async () => {
	world = await seedPagesWorld();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
	browser = await launchBrowser();
	page = await browser.context.newPage();
	const cookie = `rankseal_session=${world.sessions.lead}`;
	const listed = await fetch(`${app.origin}/api/v1/claims`, { headers: { cookie } });
	claims = (await listed.json()).items;
	await signedInAs('lead');
	await page.goto(`${app.origin}/group`);
	groupUrl = new URL(
		await page.locator('a[href^="/group/"]').first().getAttribute('href')!,
		app.origin
	).pathname;
});
afterAll(async () => {
	await browser?.close();
	await app?.stop();
});

describe('every page fits a laptop and a phone', () => {
	const pages: [string, string, () => string][] = [
		['lead', 'landing', () => '/'],
		['lead', 'claims', () => '/claims'],
		['lead', 'claim', () => `/claims/${claims[0].id}`],
		['lead', 'check', () => `/claims/${claims[0].id}/checks/${claims[0].latestCheck!.id}`],
		['lead', 'group', () => groupUrl],
		['lead', 'tokens', () => '/settings/tokens'],
		['lead', 'account', () => '/account'],
		['admin', 'users', () => '/admin/users'],
		['admin', 'outbox', () => '/admin/outbox'],
		['editor', 'editor-claims', () => '/claims'],
		['loner', 'loner-claims', () => '/claims'],
		['lead', 'not-found', () => '/claims/no-such-claim']
	];
	for (const width of WIDTHS) {
		it.each(pages)(`as %s, %s at ${width} px`, async (who, name, url) => {
			await signedInAs(who);
			await visit(url(), name, width);
			const { scrollWidth, width: shown, out } = await overflow();
			expect(out).toEqual([]);
			expect(scrollWidth).toBeLessThanOrEqual(shown);
		});
	}

	it('keeps the claims list’s certified and verdict columns, the check list’s verdicts, Remove and Set on a phone', async () => {
		await signedInAs('lead');
		await visit('/claims', 'claims', 390);
		expect(await page.locator('[data-testid=claims-table] [data-verdict]').count()).toBe(
			claims.length
		);
		expect(
			await allOnScreen('th[data-column=certified], th[data-column=verdict], [data-verdict]')
		).toEqual([]);
		await visit(`/claims/${claims[0].id}`, 'claim', 390);
		expect(await page.locator('[data-testid=checks] [data-verdict]').count()).toBeGreaterThan(0);
		expect(await allOnScreen('[data-testid=checks] [data-verdict]')).toEqual([]);
		await visit(groupUrl, 'group', 390);
		expect(await page.locator('[data-testid=members] button').count()).toBeGreaterThan(2);
		expect(await allOnScreen('[data-testid=members] button')).toEqual([]);
		await signedInAs('admin');
		await visit('/admin/users', 'users', 390);
		expect(await page.locator('[data-testid=users] button').count()).toBeGreaterThan(2);
		expect(await allOnScreen('[data-testid=users] button, [data-testid=users] select')).toEqual([]);
	});

	it('draws chart labels at 11 px or more on a phone', async () => {
		await signedInAs('lead');
		for (const claim of claims) {
			await visit(
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

describe('the result in words', () => {
	it('names the statistic, its maximum and the coincidences; says which side is trusted', async () => {
		await signedInAs('lead');
		const symbols: Record<string, RegExp> = {
			'mub-correlation': /^S, the correlation sum .* \(at most \d+\)$/,
			'steering-2mub': /^W, the steering sum .* \(at most 2\)$/,
			'fidelity-two-basis': /^F̃, the lower bound on the fidelity .* \(at most 1\)$/
		};
		for (const claim of claims) {
			await page.goto(`${app.origin}/claims/${claim.id}/checks/${claim.latestCheck!.id}`);
			const name = (await page.textContent('[data-testid=statistic-name]'))!.replace(/\s+/g, ' ');
			expect(name.trim()).toMatch(symbols[claim.method]);
			expect(await page.textContent('[data-testid=coincidences]')).toMatch(/^[\d,]+$/);
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
		await page.goto(`${app.origin}/claims`);
		await page.keyboard.press('Tab');
		expect(await page.evaluate(() => document.activeElement?.textContent?.trim())).toBe(
			'Skip to the content'
		);
		await page.keyboard.press('Enter');
		expect(await page.evaluate(() => document.activeElement?.id)).toBe('main');
	});

	it('shows which headers sort, and tells screen readers the sort state', async () => {
		await page.goto(`${app.origin}/claims`);
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
		await page.goto(`${app.origin}${groupUrl}`);
		await Promise.all([
			page.waitForURL(/\/login/),
			page.click('[data-testid=header-sign-out] button')
		]);
		const after = await fetch(`${app.origin}/claims`, {
			headers: { cookie: `rankseal_session=${world.sessions['lead-2']}` },
			redirect: 'manual'
		});
		expect(after.status).toBe(303);
		expect(after.headers.get('location')).toMatch(/^\/login/);
	});

	it('answers 404 and 403 with our layout, a title and a way back', async () => {
		await signedInAs('lead');
		const missing = await page.goto(`${app.origin}/claims/no-such-claim`);
		expect(missing!.status()).toBe(404);
		expect(await page.title()).toBe('Nothing here — Rankseal');
		expect(await page.locator('a[aria-label="Rankseal, home"]').count()).toBe(1);
		expect(await page.getAttribute('[data-testid=error-back]', 'href')).toBe('/claims');
		await signedInAs('editor');
		const closed = await page.goto(`${app.origin}/admin/users`);
		expect(closed!.status()).toBe(403);
		expect(await page.title()).toBe('This page is not open to you — Rankseal');
		expect(await page.getAttribute('[data-testid=error-page]', 'data-status')).toBe('403');
	});

	it('reads correctly past the last page and on an empty list', async () => {
		await signedInAs('lead');
		await page.goto(`${app.origin}/claims?pageSize=1&page=99`);
		const status = (await page.textContent('[data-testid=pager-status]'))!;
		expect(status).toBe(
			`Page 99 is past the end: ${claims.length} claims fill ${claims.length} pages`
		);
		expect(await page.getAttribute('[data-testid=pager-last]', 'href')).toContain(
			`page=${claims.length}`
		);
		await page.goto(`${app.origin}/claims?pageSize=1&page=2`);
		expect(await page.textContent('[data-testid=pager-status]')).toBe(
			`2 of ${claims.length} claims, page 2 of ${claims.length}`
		);
		await signedInAs('loner');
		await page.goto(`${app.origin}/claims`);
		expect(await page.locator('[data-testid=pager]').count()).toBe(0);
		expect(await page.locator('[data-testid=new-claim]').count()).toBe(0);
		expect(await page.textContent('[data-testid=no-claims]')).toContain('not in a research group');
	});

	it('gives an editor pages meant for an editor', async () => {
		await signedInAs('editor');
		await page.goto(`${app.origin}/claims`);
		expect(await page.textContent('h1')).toBe('Claims shared with you');
		const text = (await page.textContent('main'))!;
		expect(text).toContain('No claim has been shared with you yet');
		expect(text).not.toMatch(/make the first|start a group/i);
		expect(await page.locator('nav a[href="/group"]').count()).toBe(0);
		await page.goto(`${app.origin}/group`);
		expect(await page.textContent('main')).not.toMatch(/start a group|start another group/i);
	});

	it('offers only the claim states some action can reach now', async () => {
		await signedInAs('lead');
		await page.goto(`${app.origin}/claims`);
		const states = await page.$$eval('select[name=state] option', (options) =>
			options.map((o) => (o as HTMLOptionElement).value)
		);
		expect(states).toEqual(['', 'draft', 'checked']);
	});
});

describe('keys for scripts and the mail view keep what they could do', () => {
	it('makes a key, shows it once, and withdraws it', async () => {
		await signedInAs('author1');
		await page.goto(`${app.origin}/settings/tokens`);
		await page.fill('form[action="?/create"] input[name=name]', 'night upload, lab PC 3');
		await page.click('form[action="?/create"] button');
		const secret = (await page.textContent('[data-testid=token-secret]'))!;
		expect(secret).toMatch(/^rks_\S{20,}$/);
		const works = await fetch(`${app.origin}/api/v1/claims`, {
			headers: { authorization: `Bearer ${secret}` }
		});
		expect(works.status).toBe(200);
		const item = page.locator('[data-testid=tokens] li', { hasText: 'night upload, lab PC 3' });
		await item.locator('button').click();
		await page.waitForSelector('[data-testid=tokens] li:has-text("withdrawn")', { timeout: 0 });
		const refused = await fetch(`${app.origin}/api/v1/claims`, {
			headers: { authorization: `Bearer ${secret}` }
		});
		expect(refused.status).toBe(401);
	});
});
