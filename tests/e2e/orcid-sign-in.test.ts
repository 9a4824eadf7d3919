/**
 * Sign in with ORCID in Chromium against the built app and its local fake ORCID (oidc-provider):
 * an unknown iD typed on the fake's sign-in page links nothing until the person signs in with a
 * password on the link page; the account page then shows the iD as its https://orcid.org/ URL,
 * and a fresh browser signing in with ORCID lands straight in that account. Unlinking ends it.
 * Example iD: ORCID's own (support article "Structure of the ORCID Identifier").
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../src/lib/server/accounts/auth';
import { openDatabase } from '../../src/lib/server/db';
import { newId } from '../../src/lib/server/core/ids';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';

const CARBERRY = '0000-0002-1825-0097';
const EMAIL = 'ines.varg@fjord-optics.example';
const PASSWORD = 'quartz-meadow-signal';
let app: AppServer;
const browsers: TestBrowser[] = [];
let userId = '';

async function seed(dataDir: string): Promise<void> {
	const saved = { ...process.env };
	process.env.RANKSEAL_DATA_DIR = dataDir;
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	try {
		userId = newId();
		const passwordHash = await hashPassword(PASSWORD);
		const fields = { id: userId, email: EMAIL, name: 'Ines Varg', passwordHash };
		await database.models.User.create({
			...fields,
			accountRole: 'researcher',
			emailVerifiedAt: new Date()
		});
	} finally {
		await database.sequelize.close();
		process.env = saved;
	}
}

async function freshPage(): Promise<Page> {
	const browser = await launchBrowser();
	browsers.push(browser);
	return browser.context.newPage();
}

/** From Rankseal's sign-in page to the fake ORCID's, and an iD typed there. */
async function throughFakeOrcid(page: Page, then: string | RegExp) {
	await page.goto(`${app.origin}/login`);
	await Promise.all([
		page.waitForURL(/\/interaction\//, { timeout: 0 }),
		page.getByTestId('orcid-sign-in').click()
	]);
	await page.getByLabel('ORCID iD').fill(CARBERRY);
	await page.getByLabel('Given name').fill('Ines');
	await page.getByLabel('Family name').fill('Varg');
	await Promise.all([
		page.waitForURL(then, { timeout: 0 }),
		page.getByRole('button', { name: 'Sign in with this iD' }).click()
	]);
}

beforeAll(async () => {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-orcid-e2e-'));
	await seed(dataDir);
	app = await startApp({ RANKSEAL_DATA_DIR: dataDir, ORCID_FAKE_PORT: '0' });
});
afterAll(async () => {
	for (const browser of browsers) await browser.close();
	await app?.stop();
});

describe('sign in with ORCID through the fake provider’s page', () => {
	it('links an unknown iD only after the password, then signs straight in, until unlinked', async () => {
		const page = await freshPage();
		await throughFakeOrcid(page, `${app.origin}/login/orcid`);
		expect(await page.getByTestId('orcid-pending-id').textContent()).toBe(
			`https://orcid.org/${CARBERRY}`
		);
		// Nothing is linked or signed in yet: the account page sends to the sign-in page.
		const peek = await fetch(`${app.origin}/account`, { redirect: 'manual' });
		expect(peek.status).toBe(303);

		await page.getByLabel('E-mail address').fill(EMAIL);
		await page.getByLabel('Password').fill(PASSWORD);
		await Promise.all([
			page.waitForURL(`${app.origin}/claims`, { timeout: 0 }),
			page.getByRole('button', { name: 'Sign in and link' }).click()
		]);
		await page.goto(`${app.origin}/account`);
		expect(await page.getByTestId('account-orcid').textContent()).toBe(
			`https://orcid.org/${CARBERRY}`
		);
		expect(await page.getByTestId('account-orcid').getAttribute('href')).toBe(
			`https://orcid.org/${CARBERRY}`
		);

		const again = await freshPage();
		await throughFakeOrcid(again, `${app.origin}/claims`);
		await again.goto(`${app.origin}/account`);
		expect(await again.getByTestId('account-orcid').textContent()).toContain(CARBERRY);

		await Promise.all([
			again.waitForURL(`${app.origin}/account?orcid=unlinked`, { timeout: 0 }),
			again.getByTestId('orcid-unlink').click()
		]);
		await again.getByTestId('account-no-orcid').waitFor({ timeout: 0 });
		const third = await freshPage();
		await throughFakeOrcid(third, `${app.origin}/login/orcid`);
		expect(await third.getByTestId('orcid-pending').textContent()).toContain(
			'nothing has been created or linked'
		);
	});
});
