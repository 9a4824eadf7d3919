/**
 * fidelity-target in Chromium (witnesses.md §4.3′, §9): the planner page's λ field answers with the
 * critical visibility of η Φ_λ + (1 − η) 𝟙/d²; a claim made on the new-claim form with λ from a
 * calibration run, the run uploaded on the claim page, and the page saying where λ came from.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TARGET_EXAMPLE, targetCountsCsv } from '../target-counts';
import { seedApiWorld, type ApiWorld } from './api-world';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
let browser: TestBrowser;
let page: Page;

const words = (text: string | null) => (text ?? '').replace(/\s+/g, ' ');

/**
 * §4.3′'s isotropic value F̃(v) = v + ((1 − v)/d²)[(Σλ)² − Σ_{δ≠0}(Σ_m √(λ_m λ_{m−δ}))²], written
 * out here from the contract (not the engine); the ladder's first rung is λ_0² (Bavaresco et al.,
 * Nat. Phys. 14, 1032 (2018)); the critical visibility solves F̃(η) = λ_0².
 */
function isotropic(raw: number[], v: number): number {
	const d = raw.length;
	const norm = Math.hypot(...raw);
	const l = raw.map((x) => x / norm);
	const sum = l.reduce((s, x) => s + x, 0);
	let off = 0;
	for (let delta = 1; delta < d; delta++) {
		let inner = 0;
		for (let m = 0; m < d; m++) inner += Math.sqrt(l[m] * l[(m - delta + d) % d]);
		off += inner * inner;
	}
	return v + ((1 - v) / (d * d)) * (sum * sum - off);
}

beforeAll(async () => {
	world = await seedApiWorld();
	app = await startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_DEMO: '0',
		MAIL_CATCHER_PORT: '0'
	});
	browser = await launchBrowser();
	page = await browser.context.newPage();
});
afterAll(async () => {
	await browser?.close();
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

describe('the planner page plans fidelity-target from its λ field', () => {
	it('answers λ ∝ (.863, .485, .143), Schmidt number 2: η* from §4.3′, pairs simulated', async () => {
		const { raw } = TARGET_EXAMPLE;
		// The contract's own check value first: v = 0.9 gives 0.8893355.
		expect(isotropic(raw, 0.9)).toBeCloseTo(TARGET_EXAMPLE.value, 7);
		const w = isotropic(raw, 0);
		const first = raw[0] ** 2 / raw.reduce((s, x) => s + x * x, 0);
		const critical = (first - w) / (1 - w);
		await page.goto(app.origin + '/plan');
		const form = page.getByTestId('plan-form');
		await form.locator('select[name=method]').selectOption('fidelity-target');
		await form.locator('input[name=target]').fill(raw.join(','));
		await form.locator('input[name=schmidtNumber]').fill('2');
		await form.locator('input[name=visibility]').fill('0.95');
		await form.locator('button').click();
		await page.waitForSelector('[data-testid="plan-answer"]', { timeout: 0 });
		const shown = (await page.getByTestId('critical-visibility').textContent())!.trim();
		expect(Number(shown)).toBeCloseTo(critical, 3);
		expect(await page.getByTestId('plan-target-pairs').textContent()).toMatch(
			/about [\d,]+ pairs in the computational table/
		);
	});

	it('names the λ field when λ is missing or rises', async () => {
		await page.goto(
			app.origin + '/plan?method=fidelity-target&target=0.2,0.9,0.1&schmidtNumber=2&visibility=0.9'
		);
		expect(await page.getByTestId('problem-target').textContent()).toMatch(/increase/);
		await page.goto(app.origin + '/plan?method=fidelity-target&schmidtNumber=2&visibility=0.9');
		expect(await page.getByTestId('problem-target').textContent()).toMatch(/target λ/);
		expect(await page.getByTestId('plan-answer').count()).toBe(0);
	});
});

describe('a claim with λ from a calibration run, in the browser', () => {
	it('is made on the form, takes its run on the claim page, and says where λ came from', async () => {
		await browser.context.addCookies([
			{ name: 'rankseal_session', value: world.session, url: app.origin }
		]);
		await page.goto(app.origin + '/claims/new');
		await page.locator('input[name=title]').fill('Pixel pairs, λ from a calibration run');
		await page.locator('[name=sourceDescription]').fill('Halvorsen Lake Photonics, simulated');
		await page.locator('input[name=dimension]').fill('3');
		await page.locator('input[name=method][value=fidelity-target]').check();
		await page.locator('input[name=claimedSchmidtNumber]').fill('2');
		await page.getByTestId('target-from-run').check();
		await page.locator('form button[type=submit]').last().click();
		await page.waitForSelector('[data-testid="target-run-form"]', { timeout: 0 });
		expect(words(await page.getByTestId('claim-target-source').textContent())).toMatch(
			/to be fitted on a separate calibration run/
		);
		const { raw, v } = TARGET_EXAMPLE;
		const run = targetCountsCsv(raw, v, 2e5)
			.split('\n')
			.filter((row) => !row.startsWith('1,'))
			.join('\n');
		const folder = mkdtempSync(path.join(world.dataDir, 'run-'));
		writeFileSync(path.join(folder, 'run-0412.csv'), run);
		await page.getByTestId('target-run-file').setInputFiles(path.join(folder, 'run-0412.csv'));
		await page.getByTestId('target-run-submit').click();
		await page.waitForSelector('[data-testid="target-run-form"]', {
			state: 'detached',
			timeout: 0
		});
		expect(words(await page.getByTestId('claim-target-source').textContent())).toMatch(
			/fitted on the separate calibration run run-0412\.csv/
		);
	});
});
