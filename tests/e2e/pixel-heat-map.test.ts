/**
 * A d = 1 024 counts file (issue 19, part 4) through the built app and a real Chromium: the API
 * takes the claim and the JSON file, and the claim page shows its heat maps summed in blocks,
 * painted as one image (no million-element page).
 */
import { rmSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isotropicCounts, toCountsJson } from '../../src/lib/certify/planner/white-counts';
import { seedApiWorld, type ApiWorld } from './api-world';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
let browser: TestBrowser;
let page: Page;

const call = (route: string, init: RequestInit = {}) => {
	const headers = new Headers(init.headers);
	headers.set('authorization', `Bearer ${world.tokens.lake}`);
	return fetch(app.origin + route, { ...init, headers });
};

beforeAll(async () => {
	world = await seedApiWorld();
	app = await startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_DEMO: '0',
		MAIL_CATCHER_PORT: '0',
		BODY_SIZE_LIMIT: '25M'
	});
	browser = await launchBrowser();
	await browser.context.addCookies([
		{ name: 'rankseal_session', value: world.session, url: app.origin }
	]);
	page = await browser.context.newPage();
});

afterAll(async () => {
	await browser?.close();
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

describe('d = 1 024', () => {
	it('is accepted by the API and shown as heat maps of 256 × 256 blocks of 4 × 4', async () => {
		const created = await call('/api/v1/claims', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({
				title: 'Pixel camera pairs',
				sourceDescription: 'Simulated, visibility 0.9',
				dimension: 1024,
				method: 'fidelity-two-basis',
				bases: [0, 1],
				claimedSchmidtNumber: 800
			})
		});
		expect(created.status).toBe(201);
		const claim = await created.json();
		const json = toCountsJson(isotropicCounts(1024, 0.9, [0, 1], 1e6, 3));
		const upload = await call(`/api/v1/claims/${claim.id}/datasets?name=pixels.json`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: json
		});
		expect(upload.status).toBe(201);
		expect((await upload.json()).summary).toMatchObject({ dimension: 1024, bases: [0, 1] });

		await page.goto(`${app.origin}/claims/${claim.id}`);
		// A state, not a time: the painted image carries its data URL once painted.
		await page.waitForSelector('[data-testid=heat-map] image[href^="data:image/png"]', {
			timeout: 0
		});
		expect(await page.locator('[data-testid=heat-map]').count()).toBe(2);
		expect(await page.getByTestId('heat-map-block').first().textContent()).toMatch(/4 × 4/);
		const label = await page
			.locator('[data-testid=heat-map] svg')
			.first()
			.getAttribute('aria-label');
		expect(label).toMatch(/1024 by 1024, summed in blocks of 4 by 4/);
		// The page holds one image per basis, not a rectangle per cell.
		expect(await page.locator('[data-testid=heat-map] rect').count()).toBeLessThan(200);
	});
});
