/**
 * Certificates in a real browser (issue 8): a lead issues one from the check page, downloads the
 * evidence bundle from the certificate page, and a visitor who is not signed in checks it on
 * /seal, by uploading the bundle and by its ID. A damaged copy of the bundle is refused there.
 */
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedApiWorld, type ApiWorld } from './api-world';
import { launchBrowser, type TestBrowser } from './browser';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
let claim: FinishedClaim;
let browser: TestBrowser;
let page: Page;
let bundleFile = '';
let certificateId = '';

beforeAll(async () => {
	world = await seedApiWorld();
	[claim] = await addFinishedClaims(world.dataDir, 1);
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });
	browser = await launchBrowser();
	page = await browser.context.newPage();
});
afterAll(async () => {
	await browser?.close();
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

describe('certificates in Chromium', () => {
	it('issues a certificate from the check page and shows it with its downloads', async () => {
		await browser.context.addCookies([
			{ name: 'rankseal_session', value: world.session, url: app.origin }
		]);
		await page.goto(`${app.origin}/claims/${claim.claimId}/checks/${claim.checkId}`);
		await expect(page.getByTestId('reproduce-command').textContent()).resolves.toContain(
			`--counts ${claim.fileName}`
		);
		await page.getByRole('button', { name: 'Issue certificate' }).click();
		await page.waitForURL(/\/certificates\/[0-9a-f-]+$/);
		certificateId = (await page.getByTestId('certificate-id').textContent())!.trim();
		expect(page.url()).toBe(`${app.origin}/claims/${claim.claimId}/certificates/${certificateId}`);
		await expect(page.getByTestId('certificate-status').textContent()).resolves.toBe('valid');
		const download = page.waitForEvent('download');
		await page.getByTestId('download-bundle').click();
		bundleFile = path.join(world.dataDir, 'downloaded.zip');
		await (await download).saveAs(bundleFile);
		expect(readFileSync(bundleFile).subarray(0, 2).toString()).toBe('PK');
	});

	it('checks the bundle on /seal without signing in: by upload, then by ID', async () => {
		await browser.context.clearCookies();
		await page.goto(`${app.origin}/seal`);
		await page.getByTestId('seal-upload').locator('input[type=file]').setInputFiles(bundleFile);
		await page.getByRole('button', { name: 'Check the bundle' }).click();
		const verdict = page.getByTestId('bundle-verdict');
		await expect(verdict.getAttribute('data-valid')).resolves.toBe('true');
		const record = page.getByTestId('seal-record');
		await expect(record.getAttribute('data-status')).resolves.toBe('valid');
		await expect(page.getByTestId('seal-id').textContent()).resolves.toBe(certificateId);
		// The signing key's fingerprint, as the published list names it (issue 15 part 4).
		const [key] = (await (await fetch(`${app.origin}/api/v1/signing-keys`)).json()).keys;
		await expect(page.getByTestId('bundle-key').textContent()).resolves.toContain(key.id);
		await expect(page.getByTestId('seal-key').textContent()).resolves.toContain(key.id);

		await page.goto(`${app.origin}/seal`);
		await page.getByTestId('seal-lookup').locator('input[name=q]').fill(certificateId);
		await page.getByRole('button', { name: 'Look it up' }).click();
		await page.waitForURL(/\?q=/);
		await expect(record.getAttribute('data-status')).resolves.toBe('valid');
		await expect(page.getByTestId('seal-id').textContent()).resolves.toBe(certificateId);
	});

	it('refuses a bundle with one byte changed, naming what failed', async () => {
		const bytes = readFileSync(bundleFile);
		// Flip a byte in the middle, inside some stored file's data or the zip's own structure.
		bytes[Math.floor(bytes.length / 2)] ^= 0x01;
		const damaged = path.join(world.dataDir, 'damaged.zip');
		writeFileSync(damaged, bytes);
		await page.goto(`${app.origin}/seal`);
		await page.getByTestId('seal-upload').locator('input[type=file]').setInputFiles(damaged);
		await page.getByRole('button', { name: 'Check the bundle' }).click();
		const verdict = page.getByTestId('bundle-verdict');
		await expect(verdict.getAttribute('data-valid')).resolves.toBe('false');
		await expect(verdict.textContent()).resolves.toMatch(/failed at \S+/);
	});

	it('answers "unknown" for an ID it never issued', async () => {
		await page.goto(`${app.origin}/seal/00000000-0000-4000-8000-000000000000`);
		const record = page.getByTestId('seal-record');
		await expect(record.getAttribute('data-status')).resolves.toBe('unknown');
	});
});
