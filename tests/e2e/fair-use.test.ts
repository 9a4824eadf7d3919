/**
 * Fair use in a real browser against the built app: a running check is cancelled with the check
 * page's button and the page says by whom; the check form shows the resamples ceiling for the
 * claim; the group page shows the lead the storage used against the quota. The app's check
 * worker waits until it is aborted, so the check is still running whenever the test looks.
 */
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { openDatabase } from '../../src/lib/server/db';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { newId } from '../../src/lib/server/core/ids';
import { asUser } from '../integration/actors';
import {
	addGroup,
	addUser,
	bytesOf,
	claimFields,
	countsCsv
} from '../integration/backend-fixtures';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';
import { waitingWorker, type WaitingWorker } from '../waiting-worker';

let app: AppServer;
let browser: TestBrowser;
let page: Page;
let worker: WaitingWorker;
let dataDir: string;
const ids = { group: '', claim: '', check: '', session: '' };

/** A group with one claim, its counts and one queued check, written before the app starts. */
async function seed(dataDir: string): Promise<void> {
	const saved = { ...process.env };
	process.env.RANKSEAL_DATA_DIR = dataDir;
	process.env.RANKSEAL_CHECK_WORKER = worker.realWorker;
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	try {
		ids.group = await addGroup(database, 'Tarn Photonics (fictional)');
		const lead = await addUser(database, 'Lena Lead', [[ids.group, 'lead']]);
		ids.claim = (await createClaim(database, asUser(lead), claimFields)).id;
		const upload = { bytes: bytesOf(countsCsv()), originalName: 'tarn.csv' };
		const dataset = await addDataset(database, asUser(lead), ids.claim, upload);
		await stopCheckRunner(database);
		ids.check = newId();
		await database.models.Check.create({
			...{ id: ids.check, claimId: ids.claim, datasetId: dataset.id, createdBy: lead },
			...{ status: 'queued', progress: 0, resamples: 10_000, confidence: 0.99865, seed: 1 }
		});
		ids.session = newId().replaceAll('-', '');
		const expiresAt = new Date(Date.now() + 86_400_000);
		await database.models.Session.create({ id: sessionKey(ids.session), userId: lead, expiresAt });
	} finally {
		await database.sequelize.close();
		process.env = saved;
	}
}

beforeAll(async () => {
	worker = await waitingWorker();
	dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-fair-use-'));
	await seed(dataDir);
	app = await startApp({
		RANKSEAL_DATA_DIR: dataDir,
		RANKSEAL_CHECK_WORKER: worker.file,
		RANKSEAL_CHECK_WORKERS: '1',
		RANKSEAL_CHECKS_PER_USER: '1',
		RANKSEAL_CHECK_RETRY_AFTER_S: '30'
	});
	browser = await launchBrowser();
	page = await browser.context.newPage();
	await browser.context.addCookies([
		{ name: 'rankseal_session', value: ids.session, url: app.origin }
	]);
});

afterAll(async () => {
	await browser?.close();
	await app?.stop();
	worker?.remove();
	if (dataDir) rmSync(dataDir, { recursive: true, force: true });
});

describe('fair use pages', () => {
	it('cancels the running check with the page’s button and says who cancelled it', async () => {
		await page.goto(`${app.origin}/claims/${ids.claim}/checks/${ids.check}`);
		await page.getByRole('button', { name: 'Cancel this check' }).click();
		const cancelled = page.getByTestId('check-cancelled');
		await cancelled.waitFor({ timeout: 0 });
		expect(await cancelled.textContent()).toMatch(/Cancelled by Lena Lead/);
		expect(await page.getByTestId('cancel-check').count()).toBe(0);
		const cookie = `rankseal_session=${ids.session}`;
		const api = await fetch(`${app.origin}/api/v1/checks/${ids.check}`, { headers: { cookie } });
		expect(await api.json()).toMatchObject({ status: 'cancelled', cancelledBy: 'Lena Lead' });
	});

	it('answers the check form over the per-person limit with 429, Retry-After and the limit in words', async () => {
		const post = () =>
			fetch(`${app.origin}/claims/${ids.claim}?/check`, {
				method: 'POST',
				redirect: 'manual',
				headers: {
					cookie: `rankseal_session=${ids.session}`,
					origin: app.origin,
					accept: 'text/html'
				},
				body: new URLSearchParams({ resamples: '1000', confidence: '0.99865', seed: '3' })
			});
		// The first check was cancelled above, so this one takes the person's one place.
		expect((await post()).status).toBe(303);
		const refused = await post();
		expect(refused.status).toBe(429);
		expect(refused.headers.get('retry-after')).toBe('30');
		expect(await refused.text()).toContain('the limit is 1 per person');
	});

	it('shows the resamples ceiling for the claim’s d and bases beside the check form', async () => {
		await page.goto(`${app.origin}/claims/${ids.claim}`);
		// d = 5: at most 6 × 25 = 150 cells, so the absolute 10⁶ is the lower ceiling.
		expect(await page.getByTestId('resamples-ceiling').textContent()).toBe(
			'at most 1,000,000 here'
		);
		expect(await page.locator('input[name="resamples"]').getAttribute('max')).toBe('1000000');
	});

	it('shows the lead the group’s storage against its quota', async () => {
		await page.goto(`${app.origin}/group/${ids.group}`);
		const storage = page.getByTestId('group-storage');
		// One counts file, stored once: its own size in bytes, under the default 1 GiB.
		const size = bytesOf(countsCsv()).byteLength;
		expect(await storage.textContent()).toContain(`take ${size} bytes of its 1 GiB`);
	});
});
