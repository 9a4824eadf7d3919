/**
 * What editors, referees and the admin tripped over (issue 18), in Chromium at 1366 px and 390 px:
 * a copy button for a new review link, a fresh-seed re-run that shows how far it moved the bound,
 * the report form's error in the form's own words, an admin home, no "In preparation" on the
 * landing page, and a dataset list that does not scroll sideways on a phone.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { launchBrowser, type TestBrowser } from './browser';
import { seedFaceWorld, type FaceWorld } from './face-world';
import { startApp, type AppServer } from './server';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 600_000 });
const STATE_WAIT = { timeout: 240_000 };
const WIDTHS = [1366, 390] as const;

let world: FaceWorld;
let app: AppServer;
let browser: TestBrowser;
let page: Page;

async function visit(who: string | null, url: string, width: number) {
	await browser.context.clearCookies();
	if (who)
		await browser.context.addCookies([
			{ name: 'rankseal_session', value: world.sessions[who], url: app.origin }
		]);
	await page.setViewportSize({ width, height: 900 });
	const response = await page.goto(`${app.origin}${url}`);
	expect(response?.status()).toBe(200);
}

beforeAll(async () => {
	world = await seedFaceWorld();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
	browser = await launchBrowser();
	await browser.context.grantPermissions(['clipboard-read', 'clipboard-write'], {
		origin: app.origin
	});
	page = await browser.context.newPage();
});
afterAll(async () => {
	await browser?.close();
	await app?.stop();
});

describe.each(WIDTHS)('at %i px', (width) => {
	it('a new review link comes with a copy button that puts it on the clipboard', async () => {
		await visit('editor', '/editor', width);
		const card = page.locator('form[action="?/createLink"]').first();
		await card.locator('input[name=label]').fill(`Referee at ${width}`);
		await card.locator('[data-testid=create-link]').click();
		const url = (await page.locator('[data-testid=new-link-url]').textContent())!.trim();
		await page.click('[data-testid=copy-link]');
		await page.locator('[data-testid=copy-link][data-state=copied]').waitFor();
		expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(url);
	});

	it('a share the editor has not opened is not marked opened', async () => {
		await visit('author1', `/claims/${world.claims.shared}/sharing`, width);
		const body = (await page.textContent('main'))!;
		expect(body).toContain('Quarterly Optics Letters');
		expect(body).not.toContain('(opened)');
	});

	it('the admin lands on a home of their own, not "not in a research group"', async () => {
		await visit('admin', '/claims', width);
		const home = page.locator('[data-testid=admin-home]');
		await home.waitFor();
		expect(await home.locator('a[href="/admin/users"]').count()).toBe(1);
		expect(await page.textContent('main')).not.toMatch(/not in a research group/);
	});

	it('the landing page no longer marks review links as in preparation', async () => {
		await visit(null, '/', width);
		expect(await page.textContent('body')).toContain('Links for referees');
		expect(await page.textContent('body')).not.toMatch(/in preparation/i);
	});

	it("the dataset list's columns do not scroll sideways", async () => {
		await visit('lead', `/claims/${world.claims.shared}`, width);
		const sizes = await page.$eval('[data-testid=datasets]', (table) => ({
			table: table.scrollWidth,
			box: table.parentElement!.clientWidth
		}));
		expect(sizes.table).toBeLessThanOrEqual(sizes.box);
	});
});

describe('the referee', () => {
	const reviewPath = () =>
		new URL(readFileSync(path.join(world.dataDir, 'demo', 'review-link.txt'), 'utf8').trim())
			.pathname;

	it("is told in the form's words to choose a recommendation", async () => {
		await visit(null, reviewPath(), 390);
		await page.click('[data-testid=file-report]');
		const alert = page.locator('[data-testid=report] [role=alert]');
		await alert.waitFor();
		expect(await alert.textContent()).toContain(
			'Choose a recommendation: Sound, Needs revision or Unsound.'
		);
		expect(await alert.textContent()).not.toContain('needs-revision');
	});

	it('sees how far a fresh seed moved the bound, to ten decimals', async () => {
		await visit(null, reviewPath(), 1366);
		await page.fill('input[name=seed]', '424242');
		await page.click('[data-testid=rerun-button]');
		const done = page.locator('[data-testid=rerun][data-status=done]');
		await done.waitFor(STATE_WAIT);
		expect(await done.textContent()).toContain('(fresh)');
		expect(await done.locator('[data-testid=rerun-lower]').textContent()).toMatch(
			/^-?\d+\.\d{10}$/
		);
		const moved = await done.locator('[data-testid=rerun-difference]').textContent();
		expect(moved).toMatch(/The certificate's bound is -?\d+\.\d{10}; this seed moved it by/);
	});
});
