/**
 * An invitation opened by someone signed in with another address, in Chromium against the built
 * app: the page names the invited address only masked, and accepting is refused with 403 in the
 * same masked words; the invitee, signed in, joins with the page's button, and only then does the
 * header offer the archive.
 */
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maskedAddress } from '../../src/lib/server/access/masked-address';
import { openDatabase, type Database } from '../../src/lib/server/db';
import { newId, newSecret } from '../../src/lib/server/core/ids';
import { addGroup, addUser } from '../integration/backend-fixtures';
import { launchBrowser, type TestBrowser } from './browser';
import { startApp, type AppServer } from './server';

let app: AppServer;
const browsers: TestBrowser[] = [];
const world = { group: '', token: '', inviteeEmail: '', invitee: '', other: '' };

async function session(database: Database, userId: string): Promise<string> {
	const id = newId().replaceAll('-', '');
	const expiresAt = new Date(Date.now() + 86_400_000);
	await database.models.Session.create({ id: sessionKey(id), userId, expiresAt });
	return id;
}

/** A group, its lead, an open invitation for one person, and another person; before the app. */
async function seed(dataDir: string): Promise<void> {
	const saved = { ...process.env };
	process.env.RANKSEAL_DATA_DIR = dataDir;
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	try {
		world.group = await addGroup(database, 'Fjord Optics (fictional)');
		const lead = await addUser(database, 'Lena Lead', [[world.group, 'lead']]);
		const invitee = await addUser(database, 'Tove Invitee');
		world.inviteeEmail = (await database.models.User.findByPk(invitee))!.get('email') as string;
		const { token, hash } = newSecret();
		world.token = token;
		await database.models.Invitation.create({
			...{ id: newId(), groupId: world.group, email: world.inviteeEmail, role: 'author' },
			...{ tokenHash: hash, invitedBy: lead, expiresAt: new Date(Date.now() + 86_400_000) }
		});
		world.invitee = await session(database, invitee);
		world.other = await session(database, await addUser(database, 'Otto Other'));
	} finally {
		await database.sequelize.close();
		process.env = saved;
	}
}

async function pageAs(sessionId: string): Promise<Page> {
	const browser = await launchBrowser();
	browsers.push(browser);
	await browser.context.addCookies([
		{ name: 'rankseal_session', value: sessionId, url: app.origin }
	]);
	return browser.context.newPage();
}

beforeAll(async () => {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-invitation-'));
	await seed(dataDir);
	app = await startApp({ RANKSEAL_DATA_DIR: dataDir });
});
afterAll(async () => {
	for (const browser of browsers) await browser.close();
	await app?.stop();
});

describe('an invitation opened by someone else', () => {
	it('shows the invited address masked, and refuses to accept with 403 in the same words', async () => {
		const masked = maskedAddress(world.inviteeEmail);
		expect(masked).toMatch(/^t\*\*\*@e\*\*\*\.test$/);
		const page = await pageAs(world.other);
		await page.goto(`${app.origin}/invite/${world.token}`);
		const main = (await page.textContent('main'))!.replace(/\s+/g, ' ');
		expect(main).toContain(`the invitation is for ${masked}`);
		expect(await page.content()).not.toContain(world.inviteeEmail);
		const refused = await fetch(`${app.origin}/invite/${world.token}?/accept`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				cookie: `rankseal_session=${world.other}`,
				origin: app.origin,
				accept: 'text/html'
			},
			body: new URLSearchParams()
		});
		expect(refused.status).toBe(403);
		const html = await refused.text();
		expect(html).toContain(
			`This invitation was sent to another address; sign in as ${masked} to accept it.`
		);
		expect(html).not.toContain(world.inviteeEmail);
	});

	it('lets the invitee join with the page’s button; the header offers the archive only then', async () => {
		const page = await pageAs(world.invitee);
		await page.goto(`${app.origin}/invite/${world.token}`);
		const headerLink = (href: string) => page.locator(`nav[aria-label=Main] a[href="${href}"]`);
		// In no group yet: the archive would answer 403, so the header does not offer it.
		expect(await headerLink('/archive').count()).toBe(0);
		expect(await headerLink('/group').count()).toBe(1);
		await Promise.all([
			page.waitForURL(`${app.origin}/group/${world.group}`, { timeout: 0 }),
			page.getByRole('button', { name: 'Join Fjord Optics (fictional)' }).click()
		]);
		await headerLink('/archive').waitFor({ timeout: 0 });
		await headerLink('/archive').click();
		await page.waitForURL(`${app.origin}/archive`, { timeout: 0 });
		expect(await page.locator('[data-testid=error-page]').count()).toBe(0);
	});
});
