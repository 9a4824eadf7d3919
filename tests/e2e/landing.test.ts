/** The landing page in a real Chromium against the built app: the live example runs in the page. */
import { copyFile, mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';

let app: AppServer;
let browser: TestBrowser;
let page: Page;
let shots: string;
const requested: string[] = [];
const pageErrors: string[] = [];

/** Waits until the result panel shows a finished check of `method`. */
async function waitForResult(method: string) {
	await page.waitForSelector(
		`[data-testid="result"][data-method="${method}"][data-running="false"] [data-testid="certified-schmidt-number"]`,
		{ timeout: 0 } // a state, not a time: only the test runner's timeout bounds it
	);
}

async function certifiedNumber(): Promise<number> {
	return Number((await page.getByTestId('certified-schmidt-number').textContent())?.trim());
}

beforeAll(async () => {
	app = await startApp();
	browser = await launchBrowser();
	shots = await mkdtemp(join(tmpdir(), 'rankseal-shots-'));
	browser.context.on('request', (request) => requested.push(request.url()));
	page = await browser.context.newPage();
	page.on('pageerror', (error) => pageErrors.push(error.message));
	await page.goto(app.origin + '/');
});

afterAll(async () => {
	await browser?.close();
	await app?.stop();
	if (shots) await rm(shots, { recursive: true, force: true });
});

describe('landing page', () => {
	it('says what Rankseal does and names the three methods', async () => {
		await expect(page.locator('h1').textContent()).resolves.toMatch(/certificate/i);
		for (const id of ['mub-correlation', 'steering-2mub', 'fidelity-two-basis']) {
			expect(await page.locator('code', { hasText: id }).count()).toBeGreaterThan(0);
		}
		expect(await page.getByText('Simulated', { exact: true }).count()).toBeGreaterThan(0);
	});

	it('runs the check on its own and shows a certified Schmidt number from 1 to 7', async () => {
		await waitForResult('mub-correlation');
		const certified = await certifiedNumber();
		expect(Number.isInteger(certified)).toBe(true);
		expect(certified).toBeGreaterThanOrEqual(1);
		expect(certified).toBeLessThanOrEqual(7);
		await expect(page.getByTestId('statistic').textContent()).resolves.toMatch(/\d\.\d+ ± \d\.\d+/);
		// Beside the certified number: how far from unbiased the bases may be (docs/statistics.md §8).
		if (certified > 1)
			await expect(page.getByTestId('calibration-tolerance').textContent()).resolves.toMatch(
				/holds for bases unbiased to within \d+(\.\d+)? %/
			);
	});

	it('draws one rung per bound: six for d = 7, and both charts', async () => {
		expect(await page.locator('[data-testid="ladder-chart"] [data-rung]').count()).toBe(6);
		expect(await page.locator('[data-testid="visibility-chart"] [data-point]').count()).toBe(6);
		expect(await page.locator('[data-testid="bounds-table"] tbody tr').count()).toBe(6);
	});

	it('re-runs with another method and seed', async () => {
		await page.locator('select[name="method"]').selectOption('steering-2mub');
		await page.locator('input[name="seed"]').fill('7');
		await page.getByRole('button', { name: 'Run the check' }).click();
		await waitForResult('steering-2mub');
		const certified = await certifiedNumber();
		expect(certified).toBeGreaterThanOrEqual(1);
		expect(certified).toBeLessThanOrEqual(7);
		await expect(page.getByTestId('result').textContent()).resolves.toContain('seed 7');
		await expect(page.getByTestId('calibration-tolerance').textContent()).resolves.toMatch(
			/Side B’s tolerance is not computed/
		);
		expect(await page.locator('[data-testid="ladder-chart"] [data-rung]').count()).toBe(6);
	});

	it('takes a non-empty screenshot', async () => {
		const file = join(shots, 'landing.png');
		await page.screenshot({ path: file, fullPage: true });
		expect((await stat(file)).size).toBeGreaterThan(10_000);
		// Set RANKSEAL_KEEP_SCREENSHOT=/some/file.png to look at the page after the run.
		if (process.env.RANKSEAL_KEEP_SCREENSHOT)
			await copyFile(file, process.env.RANKSEAL_KEEP_SCREENSHOT);
	});

	it('asks nothing of any host but the app itself, fonts included', async () => {
		expect(requested.length).toBeGreaterThan(0);
		const outside = requested.filter((url) => {
			const { protocol, hostname } = new URL(url);
			return !['data:', 'blob:'].includes(protocol) && hostname !== '127.0.0.1';
		});
		expect(outside).toEqual([]);
		expect(requested.some((url) => /noto-serif.*\.woff2/.test(url))).toBe(true);
	});

	it('throws no errors in the page', () => {
		expect(pageErrors).toEqual([]);
	});
});
