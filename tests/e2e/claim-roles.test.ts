/**
 * Withdrawn claims and who sees what, in Chromium at 1366 px and 390 px (issue 18): no verdict
 * badge for a withdrawn claim as if it stood, /seal gives the withdrawal's reason and date, the
 * claim page offers withdrawal with a confirmation step, and each role sees only what it may do.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { launchBrowser, type TestBrowser } from './browser';
import { seedFaceWorld, WITHDRAW_REASON, type FaceWorld } from './face-world';
import { startApp, type AppServer } from './server';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 600_000 });
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
	page = await browser.context.newPage();
});
afterAll(async () => {
	await browser?.close();
	await app?.stop();
});

describe.each(WIDTHS)('at %i px', (width) => {
	it('the claims list shows a withdrawn claim as withdrawn, with no standing verdict badge', async () => {
		await visit('lead', '/claims', width);
		const row = page.locator(`tr[data-claim="${world.claims.withdrawn}"]`);
		await row.waitFor();
		expect(await row.locator('[data-verdict=withdrawn]').count()).toBe(1);
		expect(
			await row.locator('[data-verdict=supported], [data-verdict="not supported"]').count()
		).toBe(0);
	});

	it('the claim page and the check page show no verdict as if it stood', async () => {
		await visit('lead', `/claims/${world.claims.withdrawn}`, width);
		const standing = '[data-verdict=supported], [data-verdict="not supported"]';
		expect(await page.locator(standing).count()).toBe(0);
		const check = await page.locator('[data-testid=checks] a').first().getAttribute('href');
		await visit('lead', check!, width);
		expect(await page.getAttribute('[data-testid=verdict]', 'data-verdict')).toBe('withdrawn');
		expect(await page.textContent('[data-testid=verdict]')).toContain(WITHDRAW_REASON);
	});

	it("the certificate's own page gives the withdrawal's reason and date too", async () => {
		await visit(
			'lead',
			`/claims/${world.claims.withdrawn}/certificates/${world.withdrawnCertificate}`,
			width
		);
		const text = await page.textContent('[data-testid=certificate-withdrawal]');
		expect(text).toContain(WITHDRAW_REASON);
		expect(text).toMatch(/Withdrawn on \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d UTC/);
	});

	it('/seal shows the withdrawal reason and its date in words', async () => {
		await visit(null, `/seal/${world.withdrawnCertificate}`, width);
		const text = await page.textContent('[data-testid=seal-withdrawal]');
		expect(text).toContain(WITHDRAW_REASON);
		expect(text).toMatch(/Withdrawn on \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d UTC/);
	});

	it('an editor on a shared claim gets no upload box, check form or sharing link', async () => {
		await visit('editor', `/claims/${world.claims.shared}`, width);
		await page.locator('[data-testid=claim-title]').waitFor();
		expect(await page.locator('input[name=counts]').count()).toBe(0);
		expect(await page.locator('form[action="?/check"]').count()).toBe(0);
		expect(await page.locator('[data-testid=sharing-link]').count()).toBe(0);
		expect(await page.locator('[data-testid=withdraw-claim]').count()).toBe(0);
		expect(await page.getAttribute('[data-testid=editor-link]', 'href')).toBe('/editor');
	});

	it('"Correct the claim" shows to its author but not to another member who may not edit it', async () => {
		await visit('author1', `/claims/${world.claims.fresh}`, width);
		expect(await page.locator('[data-testid=edit-claim]').count()).toBe(1);
		await visit('author2', `/claims/${world.claims.fresh}`, width);
		await page.locator('[data-testid=claim-title]').waitFor();
		expect(await page.locator('[data-testid=edit-claim]').count()).toBe(0);
		expect(await page.locator('[data-testid=withdraw-claim]').count()).toBe(0);
	});
});

describe('withdrawing from the claim page', () => {
	it('asks for a reason and a confirmation, then shows the claim withdrawn', async () => {
		await visit('lead', `/claims/${world.claims.spare}`, 390);
		await page.click('[data-testid=withdraw-claim] summary');
		await page.fill('[data-testid=withdraw-claim] textarea[name=reason]', 'Superseded by run 4.');
		// Without the box ticked the browser keeps the form (required), and nothing is withdrawn.
		await page.click('[data-testid=withdraw-submit]');
		expect(await page.locator('[data-testid=claim-withdrawn]').count()).toBe(0);
		// The server asks for the confirmation too, in the form's words.
		await page.$eval('input[name=confirm]', (el) => el.removeAttribute('required'));
		await page.click('[data-testid=withdraw-submit]');
		await page.locator('[data-testid=withdraw-claim] [role=alert]').waitFor();
		expect(await page.textContent('[data-testid=withdraw-claim] [role=alert]')).toMatch(
			/Tick the box to confirm/
		);
		await page.check('input[name=confirm]');
		await page.click('[data-testid=withdraw-submit]');
		await page.locator('[data-testid=claim-withdrawn]').waitFor();
		expect(await page.textContent('[data-testid=claim-withdrawn]')).toContain(
			'Superseded by run 4.'
		);
		expect(await page.locator('[data-testid=withdraw-claim]').count()).toBe(0);
	});
});
