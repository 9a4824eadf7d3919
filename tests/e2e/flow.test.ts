/**
 * The main flow in a real browser against the built app (issue 3): sign up, read the
 * verification e-mail from the mail catcher in the admin outbox, verify, start a group, create a
 * claim, upload counts, watch the progress bar, see the verdict and the ladder chart. Then
 * another group's member gets 404 for that claim, its check and its datasets, pages and API alike.
 */
import { mkdtempSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, type TestBrowser } from './browser';
import { openDatabase } from '../../src/lib/server/db';
import { newId } from '../../src/lib/server/core/ids';
import { seedFlowWorld, type FlowWorld } from './flow-world';
import { startApp, type AppServer } from './server';

const EXAMPLE = path.resolve('tests/fixtures/example-d5-three-bases.csv');
let app: AppServer;
let world: FlowWorld;
let browser: TestBrowser;
let page: Page;
let claimUrl = '';
let checkUrl = '';
const shots = mkdtempSync(path.join(tmpdir(), 'rankseal-flow-shots-'));

beforeAll(async () => {
	world = await seedFlowWorld();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
	browser = await launchBrowser();
	page = await browser.context.newPage();
});
afterAll(async () => {
	await browser?.close();
	await app?.stop();
});

/** Pixels of a PNG that differ from its most common colour, counted by the browser's canvas. */
async function drawnPixels(
	png: Buffer
): Promise<{ drawn: number; total: number; colours: number }> {
	return page.evaluate(async (base64) => {
		const image = new Image();
		image.src = `data:image/png;base64,${base64}`;
		await image.decode();
		const canvas = document.createElement('canvas');
		canvas.width = image.width;
		canvas.height = image.height;
		const context = canvas.getContext('2d')!;
		context.drawImage(image, 0, 0);
		const { data } = context.getImageData(0, 0, image.width, image.height);
		const counts = new Map<number, number>();
		for (let i = 0; i < data.length; i += 4) {
			const key = (data[i] << 16) | (data[i + 1] << 8) | data[i + 2];
			counts.set(key, (counts.get(key) ?? 0) + 1);
		}
		const background = Math.max(...counts.values());
		return { drawn: data.length / 4 - background, total: data.length / 4, colours: counts.size };
	}, png.toString('base64'));
}

describe('the main flow in Chromium', () => {
	const email = 'wren.ashdown@example.test';

	it('signs up and confirms the address through the e-mail caught by the local catcher', async () => {
		await page.goto(`${app.origin}/signup`);
		await page.fill('input[name=name]', 'Wren Ashdown');
		await page.fill('input[name=email]', email);
		await page.fill('input[name=password]', 'a long enough passphrase');
		await Promise.all([
			page.waitForURL(/\/signup\?sent=1/),
			page.click('form[action="?/signup"] button')
		]);
		// The admin reads the outbox in a browser of their own, as a person would.
		const admin = await launchBrowser();
		await admin.context.addCookies([
			{ name: 'rankseal_session', value: world.adminSession, url: app.origin }
		]);
		const adminPage = await admin.context.newPage();
		await adminPage.goto(`${app.origin}/admin/outbox`);
		await adminPage
			.locator('[data-testid=outbox] li', { hasText: email })
			.locator('a')
			.first()
			.click();
		const text = await adminPage.textContent('[data-testid=message-text]');
		const link = text?.match(/https?:\/\/\S+\/verify\/\S+/)?.[0];
		expect(link, `no verification link in: ${text}`).toMatch(`${app.origin}/verify/`);
		await admin.close();
		await page.goto(link!);
		await Promise.all([
			page.waitForURL(/verified=1/),
			page.click('form[action="?/confirm"] button')
		]);
		// Signing up opens no session (it answers alike for a taken address): sign in now.
		await page.fill('input[name=email]', email);
		await page.fill('input[name=password]', 'a long enough passphrase');
		await Promise.all([
			page.waitForURL((url) => !url.pathname.startsWith('/login')),
			page.click('form[action="?/login"] button')
		]);
	});

	it('starts a group and creates a claim', async () => {
		await page.goto(`${app.origin}/group`);
		await page.fill('form[action="?/create"] input[name=name]', 'Ashdown Fibre Lab (fictional)');
		await page.click('form[action="?/create"] button');
		await page.waitForLoadState('networkidle');
		await page.goto(`${app.origin}/claims/new`);
		await page.fill('input[name=title]', 'Frequency bins at d = 5');
		await page.fill(
			'textarea[name=sourceDescription]',
			'Simulated frequency-bin pairs, five bins.'
		);
		await page.fill('input[name=dimension]', '5');
		await page.check('input[name=method][value=fidelity-two-basis]');
		await page.fill('input[name=bases]', '0,1');
		await page.selectOption('select[name=fourier]', 'cyclic');
		await page.fill('input[name=claimedSchmidtNumber]', '4');
		await Promise.all([
			page.waitForURL(/\/claims\/[0-9a-f-]{36}$/),
			page.click('form[action="?/create"] button')
		]);
		claimUrl = page.url();
		expect(await page.textContent('[data-testid=claim-title]')).toContain(
			'Frequency bins at d = 5'
		);
		expect(await page.textContent('[data-testid=claim-fourier]')).toContain(
			'cyclic Fourier basis (ℤ_5)'
		);
	});

	it('rejects a bad file with its line number, then previews a good one as heat maps', async () => {
		const bad = path.join(shots, 'bad.csv');
		(await import('node:fs')).writeFileSync(
			bad,
			'basis,outcome_a,outcome_b,counts\n0,0,0,5\n0,0,1,-2\n'
		);
		await page.setInputFiles('[data-testid=upload-form] input[type=file]', bad);
		await page.click('[data-testid=upload-form] button');
		await expect(page.locator('[data-testid=upload-error]').textContent()).resolves.toMatch(
			/line 3/i
		);
		await page.setInputFiles('[data-testid=upload-form] input[type=file]', EXAMPLE);
		await page.click('[data-testid=upload-form] button');
		await page.waitForSelector('[data-testid=heat-map]');
		expect(await page.locator('[data-testid=heat-map]').count()).toBe(3);
	});

	it('runs a check from the form and shows the verdict and the ladder without a reload', async () => {
		await Promise.all([
			page.waitForURL(/\/checks\//),
			page.click('[data-testid=check-form] button')
		]);
		checkUrl = page.url();
		await page.evaluate(() => ((window as unknown as { marker: number }).marker = 42));
		// Waits for a state, not for a time: only the test runner's timeout bounds it.
		await page.waitForSelector('[data-testid=check][data-status=done]', { timeout: 0 });
		expect(await page.textContent('[data-testid=check-fourier]')).toContain('cyclic Fourier basis');
		expect(await page.evaluate(() => (window as unknown as { marker?: number }).marker)).toBe(42);
		expect(page.url()).toBe(checkUrl);
		await expect(page.textContent('[data-testid=verdict]')).resolves.toMatch(/supported/i);
		const certified = Number(await page.textContent('[data-testid=certified-schmidt-number]'));
		expect(certified).toBeGreaterThanOrEqual(1);
		expect(certified).toBeLessThanOrEqual(5);
		const chart = page.locator('[data-testid=ladder-chart]');
		expect(await chart.locator('[data-rung]').count()).toBe(4);
		const png = await chart.screenshot({ path: path.join(shots, 'ladder.png') });
		expect(statSync(path.join(shots, 'ladder.png')).size).toBeGreaterThan(2000);
		const pixels = await drawnPixels(png);
		expect(pixels.drawn / pixels.total).toBeGreaterThan(0.02);
		expect(pixels.colours).toBeGreaterThan(8);
		await page.screenshot({ path: path.join(shots, 'result.png'), fullPage: true });
	});

	it('moves the progress bar through each value the check records, then shows the result, without a reload', async () => {
		// Paced by the test: it writes a running check's progress into the app's own SQLite file,
		// one value at a time, and waits for the page to show each (the runner's own progress
		// writes are covered in tests/integration/checks.test.ts). Nothing here depends on speed.
		const database = await openDatabase(path.join(world.dataDir, 'rankseal.sqlite'));
		const { Check } = database.models;
		const finished = (await Check.findByPk(checkUrl.split('/').pop()!))!.get({ plain: true });
		const id = newId();
		await Check.create({
			...finished,
			id,
			status: 'running',
			progress: 0,
			result: null,
			finishedAt: null,
			createdAt: undefined,
			updatedAt: undefined
		});
		try {
			await page.goto(`${claimUrl}/checks/${id}`);
			await page.evaluate(() => ((window as unknown as { marker: number }).marker = 7));
			const bar = '[data-testid=progress]';
			expect(await page.getAttribute(bar, 'aria-valuenow')).toBe('0');
			for (const fraction of [0.12, 0.5, 0.86]) {
				await Check.update({ progress: fraction }, { where: { id } });
				const percent = String(Math.round(fraction * 100));
				await page.waitForSelector(`${bar}[aria-valuenow="${percent}"]`, { timeout: 0 });
				expect(await page.textContent('[data-testid=progress-percent]')).toBe(`${percent} %`);
			}
			await Check.update(
				{ status: 'done', progress: 1, result: finished.result, finishedAt: new Date() },
				{ where: { id } }
			);
			await page.waitForSelector('[data-testid=check][data-status=done]', { timeout: 0 });
			expect(await page.evaluate(() => (window as unknown as { marker?: number }).marker)).toBe(7);
			expect(page.url()).toBe(`${claimUrl}/checks/${id}`);
			expect(await page.textContent('[data-testid=certified-schmidt-number]')).toBe(
				String(finished.result!.certifiedSchmidtNumber)
			);
		} finally {
			await database.sequelize.close();
		}
	});

	it('gives a member of another group 404 for the claim, its check and datasets, in pages and API', async () => {
		const cookie = `rankseal_session=${world.outsiderSession}`;
		const get = (url: string) => fetch(url, { headers: { cookie }, redirect: 'manual' });
		const claimId = claimUrl.split('/').pop()!;
		const checkId = checkUrl.split('/').pop()!;
		for (const url of [claimUrl, checkUrl]) expect((await get(url)).status, url).toBe(404);
		for (const api of [
			`/api/v1/claims/${claimId}`,
			`/api/v1/claims/${claimId}/datasets`,
			`/api/v1/checks/${checkId}`
		]) {
			const response = await get(`${app.origin}${api}`);
			expect(response.status, api).toBe(404);
			expect((await response.json()).error.code).toBe('not_found');
		}
		expect((await (await get(`${app.origin}/api/v1/claims`)).json()).items).toEqual([]);
		// The same outsider does reach pages of their own, so the 404s are not a broken session.
		expect((await get(`${app.origin}/claims`)).status).toBe(200);
	});
});
