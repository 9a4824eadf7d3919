/**
 * One running app on the demo world for the page tests, with a browser signed in as any role.
 */
import { mkdirSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { launchBrowser, type TestBrowser } from './browser';
import { seedPagesWorld, type PagesWorld } from './pages-world';
import { startApp, type AppServer } from './server';

export interface ClaimItem {
	id: string;
	method: string;
	latestCheck: { id: string } | null;
}

export interface PagesSession {
	app: AppServer;
	world: PagesWorld;
	page: Page;
	/** The demo claims as the lead's API listing gives them, each with a finished check. */
	claims: ClaimItem[];
	/** The demo group's page. */
	groupUrl: string;
	signedInAs(key: string): Promise<void>;
	/** Opens a page at a width and keeps a full-page screenshot of it. */
	visit(url: string, shot: string, width: number): Promise<unknown>;
	close(): Promise<void>;
}

export async function openPages(): Promise<PagesSession> {
	// Set RANKSEAL_KEEP_SCREENSHOTS=/some/folder to look at every page afterwards.
	const shots =
		process.env.RANKSEAL_KEEP_SCREENSHOTS ?? mkdtempSync(path.join(tmpdir(), 'rs-pages-'));
	mkdirSync(shots, { recursive: true });
	const world = await seedPagesWorld();
	const app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
	const browser: TestBrowser = await launchBrowser();
	const page = await browser.context.newPage();
	const signedInAs = async (key: string) => {
		await browser.context.clearCookies();
		await browser.context.addCookies([
			{ name: 'rankseal_session', value: world.sessions[key], url: app.origin }
		]);
	};
	const visit = async (url: string, shot: string, width: number) => {
		await page.setViewportSize({ width, height: 900 });
		const response = await page.goto(`${app.origin}${url}`);
		await page.screenshot({ path: path.join(shots, `${shot}-${width}.png`), fullPage: true });
		return response;
	};
	const cookie = `rankseal_session=${world.sessions.lead}`;
	const listed = await fetch(`${app.origin}/api/v1/claims`, { headers: { cookie } });
	const claims: ClaimItem[] = (await listed.json()).items;
	await signedInAs('lead');
	await page.goto(`${app.origin}/group`);
	const groupHref = await page.locator('a[href^="/group/"]').first().getAttribute('href');
	const groupUrl = new URL(groupHref!, app.origin).pathname;
	const close = async () => {
		await browser.close();
		await app.stop();
	};
	return { app, world, page, claims, groupUrl, signedInAs, visit, close };
}
