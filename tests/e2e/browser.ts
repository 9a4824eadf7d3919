/**
 * A real Chromium for page tests: Debian's /usr/bin/chromium driven by playwright-core, in a
 * fresh profile folder that is removed on close. Playwright refuses `--user-data-dir` in args,
 * so the profile goes through launchPersistentContext instead.
 */
import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

const ARGS = [
	'--headless',
	'--no-sandbox',
	'--disable-gpu',
	'--disable-quic',
	'--no-first-run',
	'--disable-background-networking',
	'--disable-component-update',
	'--disable-sync'
];

export interface TestBrowser {
	context: BrowserContext;
	close(): Promise<void>;
}

export async function launchBrowser(): Promise<TestBrowser> {
	if (!existsSync(CHROMIUM_PATH)) {
		throw new Error(
			`No Chromium at ${CHROMIUM_PATH}: run apt-get install -y chromium (or set CHROMIUM_PATH)`
		);
	}
	const profile = await mkdtemp(join(tmpdir(), 'rankseal-chromium-'));
	const context = await chromium.launchPersistentContext(profile, {
		executablePath: CHROMIUM_PATH,
		headless: true,
		args: ARGS,
		viewport: { width: 1280, height: 900 }
	});
	return {
		context,
		async close() {
			await context.close();
			await rm(profile, { recursive: true, force: true });
		}
	};
}
