/**
 * The planner (issue 19, part 3) in a real Chromium and over HTTP against the built app, with no
 * account: the form, the critical visibility, simulated counts, the trade-off table, bad input.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';

let app: AppServer;
let browser: TestBrowser;
let page: Page;

beforeAll(async () => {
	app = await startApp();
	browser = await launchBrowser();
	page = await browser.context.newPage();
});

afterAll(async () => {
	await browser?.close();
	await app?.stop();
});

describe('the planner page', () => {
	it('answers the steering test in d = 4 for Schmidt number 4: η* = 0.935, counts simulated', async () => {
		await page.goto(app.origin + '/plan');
		const form = page.getByTestId('plan-form');
		await form.locator('select[name=method]').selectOption('steering-2mub');
		await form.locator('input[name=dimension]').fill('4');
		await form.locator('input[name=schmidtNumber]').fill('4');
		await form.locator('input[name=visibility]').fill('0.97');
		await form.locator('button').click();
		await page.waitForSelector('[data-testid="plan-answer"]', { timeout: 0 });
		// β_3 = (1 + 1/√4)·2√3/(1 + √3), witnesses.md §4.2 (Phys. Rev. Lett. 126, 200404 (2021)).
		expect((await page.getByTestId('critical-visibility').textContent())?.trim()).toBe('0.935');
		const row = page.getByTestId('design-steering-2mub-2');
		const counts = Number(
			(await row.getByTestId('counts-per-basis').textContent())!.replace(/,/g, '')
		);
		expect(counts).toBeGreaterThan(10);
		// The trusted methods clear a lower visibility: the trade-off table says so.
		expect(await page.getByTestId('design-mub-correlation-2').textContent()).toMatch(/0\.833/);
		expect(await page.getByTestId('plan-curve').locator('circle').count()).toBeGreaterThan(8);
	});

	it('names the field at fault', async () => {
		await page.goto(
			app.origin + '/plan?method=steering-2mub&dimension=4&schmidtNumber=9&visibility=0.9'
		);
		expect(await page.getByTestId('problem-schmidtNumber').textContent()).toMatch(/dimension/);
		expect(await page.getByTestId('plan-answer').count()).toBe(0);
	});
});

describe('GET /api/v1/plan', () => {
	it('gives each rung’s critical visibility and the counts per basis', async () => {
		const q = 'method=mub-correlation&dimension=5&schmidtNumber=4&visibility=0.95&bases=all';
		const response = await fetch(`${app.origin}/api/v1/plan?${q}`);
		expect(response.status).toBe(200);
		const plan = await response.json();
		expect(plan.request.bases).toEqual([0, 1, 2, 3, 4, 5]);
		// §7: η*_r = (B_r/m − 1/d)/(1 − 1/d), B_3 = 1 + 5·3/5 = 4, m = 6.
		expect(plan.rungs[2].criticalVisibility).toBeCloseTo((4 / 6 - 1 / 5) / (1 - 1 / 5), 12);
		expect(plan.design.countsPerBasis).toBeGreaterThan(0);
		expect(plan.design.power).toBeGreaterThanOrEqual(0.9);
	});

	it('refuses a bad question naming the field', async () => {
		const response = await fetch(
			`${app.origin}/api/v1/plan?method=mub-correlation&dimension=5&schmidtNumber=4&visibility=0.95&bases=0,9`
		);
		expect(response.status).toBe(400);
		expect((await response.json()).error).toMatchObject({ code: 'bad_input', field: 'bases' });
		const missing = await fetch(`${app.origin}/api/v1/plan?method=mub-correlation`);
		expect((await missing.json()).error.field).toBe('dimension');
	});
});
