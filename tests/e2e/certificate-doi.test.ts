/**
 * A certificate's DOI and citation in a real browser (issue 21): issued from the check page, its
 * page shows the DOI at once with its registration state, the citation and the data-availability
 * sentence; once the app's sender has registered it with the local fake registry, the DOI link
 * resolves to /seal/{id}; the citation endpoint answers each format with its media type; an admin
 * sees the registration on /admin/dois and, once it has been given up, sends it again from there.
 */
import { rmSync } from 'node:fs';
import sqlite3 from 'sqlite3';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DOI_REGISTRATION_WORDS, type DoiRegistration } from '../../src/lib/doi-registration';
import { seedApiWorld, type ApiWorld } from './api-world';
import { launchBrowser, type TestBrowser } from './browser';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { newId } from '../../src/lib/server/core/ids';
import { databaseFile, readRows, whenChanged, withDatabase } from './fault-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
let claim: FinishedClaim;
let browser: TestBrowser;
let page: Page;
let certificateId = '';
const adminSession = newId().replaceAll('-', '');

/** An admin in no group, with a browser session, written before the app starts. */
async function seedAdmin(dataDir: string) {
	await withDatabase(dataDir, async ({ models: { User, Session } }) => {
		const id = newId();
		await User.create({
			...{ id, email: 'eli@example.test', name: 'Eli Moss', passwordHash: 'unused' },
			...{ accountRole: 'admin', emailVerifiedAt: new Date() }
		});
		const expiresAt = new Date(Date.now() + 86_400_000);
		await Session.create({ id: sessionKey(adminSession), userId: id, expiresAt });
	});
}

beforeAll(async () => {
	world = await seedApiWorld();
	[claim] = await addFinishedClaims(world.dataDir, 1);
	await seedAdmin(world.dataDir);
	// The app starts its own fake registry (no DATACITE_URL), here on any free port.
	app = await startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_DEMO: '0',
		DATACITE_FAKE_PORT: '0'
	});
	browser = await launchBrowser();
	page = await browser.context.newPage();
	await browser.context.addCookies([
		{ name: 'rankseal_session', value: world.session, url: app.origin }
	]);
});
afterAll(async () => {
	await browser?.close();
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

const registration = async () =>
	(await page.getByTestId('doi-registration').getAttribute('data-state')) as DoiRegistration;

describe('a certificate page with its DOI and citation', () => {
	it('shows the DOI at once, its registration state in words, the citation and the sentence', async () => {
		await page.goto(`${app.origin}/claims/${claim.claimId}/checks/${claim.checkId}`);
		await page.getByRole('button', { name: 'Issue certificate' }).click();
		await page.waitForURL(/\/certificates\/[0-9a-f-]+$/);
		certificateId = (await page.getByTestId('certificate-id').textContent())!.trim();
		const doi = `10.99999/rankseal.${certificateId}`;
		await expect(page.getByTestId('doi').textContent()).resolves.toBe(doi);
		// Pending or already registered: the app's sender runs on its own; the words match the state.
		const state = await registration();
		expect(['pending', 'registered']).toContain(state);
		await expect(page.getByTestId('doi-registration').textContent()).resolves.toContain(
			DOI_REGISTRATION_WORDS[state]
		);
		const citation = (await page.getByTestId('citation-text').textContent())!;
		expect(citation).toContain('Rankseal. Dataset.');
		expect(citation).toContain(doi);
		const sentence = (await page.getByTestId('data-availability').textContent())!;
		expect(sentence).toContain(doi);
		expect(sentence).toContain(`rankseal-evidence-${certificateId}.zip`);
	});

	it('resolves the DOI link, once registered, to the public record /seal/{id}', async () => {
		const done = async () =>
			(
				await readRows<{ status: string }>(
					world.dataDir,
					`select status from certificate_dois where certificate_id = '${certificateId}'`
				)
			)[0]?.status === 'done';
		await whenChanged(world.dataDir, done);
		await page.reload();
		expect(await registration()).toBe('registered');
		await page.getByTestId('doi').click();
		await page.waitForURL(`${app.origin}/seal/${certificateId}`);
		await expect(page.getByTestId('seal-doi').getAttribute('data-state')).resolves.toBe(
			'registered'
		);
	});

	it('answers the citation endpoint in each format with its media type, 400 naming format else', async () => {
		const url = `${app.origin}/api/v1/certificates/${certificateId}/citation`;
		const bibtex = await page.request.get(`${url}?format=bibtex`);
		expect(bibtex.headers()['content-type']).toBe('application/x-bibtex; charset=utf-8');
		expect(await bibtex.text()).toMatch(/^@misc\{rankseal-/);
		const ris = await page.request.get(`${url}?format=ris`);
		expect(ris.headers()['content-type']).toBe(
			'application/x-research-info-systems; charset=utf-8'
		);
		expect(await ris.text()).toMatch(/^TY {2}- DATA\r\n/);
		const text = await page.request.get(url);
		expect(text.headers()['content-type']).toBe('text/plain; charset=utf-8');
		const refused = await page.request.get(`${url}?format=endnote`);
		expect(refused.status()).toBe(400);
		expect(await refused.json()).toMatchObject({ error: { field: 'format' } });
	});

	it('shows an admin the registration on /admin/dois, and sends a given-up one again', async () => {
		await browser.context.clearCookies();
		await browser.context.addCookies([
			{ name: 'rankseal_session', value: adminSession, url: app.origin }
		]);
		// Reached as an admin reaches it: from the header, and from the admin's home.
		await page.goto(`${app.origin}/claims`);
		await expect(
			page.getByTestId('admin-home').locator('a[href="/admin/dois"]').count()
		).resolves.toBe(1);
		await page.getByRole('link', { name: 'DOIs', exact: true }).click();
		await page.waitForURL(`${app.origin}/admin/dois`);
		const entry = page.locator(`[data-testid=dois] li[data-certificate="${certificateId}"]`);
		await expect(entry.locator('a').first().textContent()).resolves.toBe(
			`10.99999/rankseal.${certificateId}`
		);
		await expect(entry.locator('[data-status]').textContent()).resolves.toBe('registered');
		await expect(entry.locator(`a[href="/seal/${certificateId}"]`).count()).resolves.toBe(1);
		await expect(entry.getByRole('button', { name: 'Try again now' }).count()).resolves.toBe(0);

		// As the sender leaves a registration the registry refused outright (a 401, final).
		await writeSql(
			`update certificate_dois set status = 'failed', attempts = 1, next_attempt_at = null,
			 last_error = 'the registry answered 401: bad credentials'
			 where certificate_id = '${certificateId}'`
		);
		await page.getByRole('link', { name: 'given up' }).click();
		await page.waitForURL(/status=failed/);
		await expect(entry.locator('[data-status]').textContent()).resolves.toBe('given up');
		await expect(entry.getByTestId('doi-error').textContent()).resolves.toContain('401');
		await entry.getByRole('button', { name: 'Try again now' }).click();
		await whenChanged(world.dataDir, async () => (await doiStatus()) === 'done');
		await page.goto(`${app.origin}/admin/dois`);
		await expect(entry.locator('[data-status]').textContent()).resolves.toBe('registered');
		await expect(entry.getByTestId('doi-error').count()).resolves.toBe(0);
	});
});

const doiStatus = async () =>
	(
		await readRows<{ status: string }>(
			world.dataDir,
			`select status from certificate_dois where certificate_id = '${certificateId}'`
		)
	)[0]?.status;

/** One write to the app's SQLite file on a connection of its own (the app is idle meanwhile). */
function writeSql(sql: string): Promise<void> {
	return new Promise((done, fail) => {
		const connection = new sqlite3.Database(databaseFile(world.dataDir), (e) => {
			if (e) return fail(e);
			connection.configure('busyTimeout', 10_000);
			connection.run(sql, (error) => connection.close(() => (error ? fail(error) : done())));
		});
	});
}
