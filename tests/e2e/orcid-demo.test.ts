/**
 * The demo with the fake ORCID, in Chromium: Eliot picks himself on the fake's sign-in page and
 * lands signed in (his demo account has the invented iD linked); his claim names him with the iD,
 * and so do its certificate's page, JSON (`authors[].orcid`) and PDF (read back with pdftotext)
 * and, for a visitor not signed in, the public /seal record — always as the https://orcid.org/ URL.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_CLAIMS } from '../../src/lib/server/demo/scenario';
import { DEMO_ORCID_PEOPLE } from '../../src/lib/server/demo/orcid-people';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';

const eliot = DEMO_ORCID_PEOPLE.find((p) => p.linkedTo === 'author1')!;
const URL_OF_ID = `https://orcid.org/${eliot.orcid}`;
let app: AppServer;
const browsers: TestBrowser[] = [];
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-orcid-demo-'));

async function freshPage() {
	const browser = await launchBrowser();
	browsers.push(browser);
	return browser.context.newPage();
}

beforeAll(async () => {
	app = await startApp({ RANKSEAL_DATA_DIR: folder, RANKSEAL_DEMO: '1', ORCID_FAKE_PORT: '0' });
});
afterAll(async () => {
	for (const browser of browsers) await browser.close();
	await app?.stop();
});

describe('the demo’s linked iD', () => {
	it('signs Eliot in from the fake’s list and shows on his claim, its certificate, JSON, PDF and /seal', async () => {
		const page = await freshPage();
		await page.goto(`${app.origin}/login`);
		await Promise.all([
			page.waitForURL(/\/interaction\//, { timeout: 0 }),
			page.getByTestId('orcid-sign-in').click()
		]);
		await Promise.all([
			page.waitForURL(`${app.origin}/claims`, { timeout: 0 }),
			page.getByRole('button', { name: `Eliot Brann · ${eliot.orcid}` }).click()
		]);
		const title = DEMO_CLAIMS.find((c) => c.author === 'author1')!.title;
		await Promise.all([
			page.waitForURL(/\/claims\/[0-9a-f-]+$/, { timeout: 0 }),
			page.getByRole('link', { name: title }).first().click()
		]);
		expect(await page.getByTestId('claim-author-orcid').textContent()).toBe(URL_OF_ID);
		await Promise.all([
			page.waitForURL(/\/certificates\/[0-9a-f-]+$/, { timeout: 0 }),
			page.getByTestId('certificates').getByRole('link').first().click()
		]);
		expect(await page.getByTestId('author-orcids').textContent()).toContain(
			`Eliot Brann · ${URL_OF_ID}`
		);
		const id = page.url().split('/').at(-1)!;

		const json = await (await page.request.get(`${app.origin}/api/v1/certificates/${id}`)).json();
		expect(json.authors).toContainEqual({ name: 'Eliot Brann', orcid: eliot.orcid });
		const pdf = await (
			await page.request.get(`${app.origin}/api/v1/certificates/${id}/pdf`)
		).body();
		writeFileSync(path.join(folder, 'demo.pdf'), pdf);
		const text = execFileSync('pdftotext', [path.join(folder, 'demo.pdf'), '-'], {
			encoding: 'utf8'
		});
		expect(text.replace(/\s+/g, '')).toContain(`EliotBrann${URL_OF_ID}`);

		const visitor = await freshPage();
		await visitor.goto(`${app.origin}/seal/${id}`);
		expect(await visitor.getByTestId('author-orcids').textContent()).toContain(URL_OF_ID);
	});
});
