/**
 * Script injection stays text (hostile-text-world.ts): every page that shows a typed field shows
 * its literal characters and runs none of it (no dialog, no injected element), the certificate
 * PDF read back with pdf-parse holds the literal characters, and the notices' HTML parts hold
 * them escaped.
 */
import path from 'node:path';
import { PDFParse } from 'pdf-parse';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../src/lib/server/db';
import { launchBrowser, type TestBrowser } from './browser';
import { hostile, seedHostileText, type HostileTextWorld } from './hostile-text-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: HostileTextWorld;
let browser: TestBrowser;
let page: Page;
const dialogs: string[] = [];

beforeAll(async () => {
	world = await seedHostileText();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
	browser = await launchBrowser();
	page = await browser.context.newPage();
	page.on('dialog', async (dialog) => {
		dialogs.push(dialog.message());
		await dialog.dismiss();
	});
}, 600_000);

afterAll(async () => {
	await browser?.close();
	await app?.stop();
});

const literal = (field: string) => `<script>alert("${field}")</script>`;

async function visit(who: 'author' | 'editor' | null, url: string) {
	await browser.context.clearCookies();
	if (who)
		await browser.context.addCookies([
			{ name: 'rankseal_session', value: world.sessions[who], url: app.origin }
		]);
	const response = await page.goto(app.origin + url);
	expect(response?.status(), url).toBe(200);
	return page.locator('body').innerText();
}

describe('typed text with script in it', () => {
	it('is shown literally and never runs, on every page that shows it', async () => {
		const { claimId, withdrawnId, groupId, certificateId, reviewToken } = world;
		const pages: [who: 'author' | 'editor' | null, url: string, fields: string[]][] = [
			['author', '/claims', ['title', 'author-name']],
			['author', `/claims/${claimId}`, ['title', 'notes', 'manuscript', 'group']],
			['author', `/claims/${withdrawnId}`, ['gone']],
			['author', `/claims/${claimId}/certificates/${certificateId}`, ['title']],
			['author', `/claims/${claimId}/sharing`, ['journal', 'share']],
			['author', `/group/${groupId}`, ['group', 'author-name']],
			['author', '/archive', ['title', 'reason']],
			['author', '/settings/tokens', ['token']],
			['editor', '/editor', ['title', 'journal', 'report']],
			[null, `/review/${reviewToken}`, ['title', 'report']],
			[null, `/seal/${certificateId}`, ['title']]
		];
		for (const [who, url, fields] of pages) {
			const text = await visit(who, url);
			for (const field of fields) expect(text, `${field} on ${url}`).toContain(literal(field));
			const injected = await page.evaluate(() => ({
				images: document.querySelectorAll('img[src="x"], img[onerror]').length,
				// Kit's own data script carries the text too, escaped; an injected one is just the call.
				scripts: [...document.scripts].filter((s) => /^\s*alert\(/.test(s.text)).length,
				links: document.querySelectorAll('a[href^="javascript:" i]').length
			}));
			expect(injected, url).toEqual({ images: 0, scripts: 0, links: 0 });
		}
		expect(dialogs).toEqual([]);
	}, 600_000);

	it('reads back literally from the certificate PDF', async () => {
		const url = `${app.origin}/api/v1/certificates/${world.certificateId}/pdf`;
		const cookie = `rankseal_session=${world.sessions.author}`;
		const response = await fetch(url, { headers: { cookie } });
		expect(response.status).toBe(200);
		const parser = new PDFParse({ data: new Uint8Array(await response.arrayBuffer()) });
		const text = (await parser.getText()).text.replace(/\s+/g, ' ');
		await parser.destroy();
		expect(text).toContain(literal('title'));
	});

	it('is escaped in the HTML part of every notice and literal in the text part', async () => {
		const db = await openDatabase(path.join(world.dataDir, 'rankseal.sqlite'));
		const mails = (await db.models.OutboxMail.findAll()).map((m) => m.get({ plain: true }));
		await db.sequelize.close();
		const carrying = mails.filter((m) => m.text.includes('<script>alert('));
		// The share notice, the report-filed notice and the report-released notice at least.
		expect(carrying.length).toBeGreaterThanOrEqual(3);
		for (const mail of mails) {
			expect(mail.html, mail.kind).not.toMatch(/<script>alert\(|<img src=x/i);
			expect(mail.subject, mail.kind).not.toMatch(/[\r\n]/);
		}
		for (const mail of carrying) expect(mail.html, mail.kind).toContain('&lt;script&gt;alert(');
		expect(hostile('x')).toContain('javascript:');
	});
});
