/**
 * Sharing and review in a real browser against the built app (issue 9): an author shares a
 * certified claim; the editor reads the notice in the admin outbox, makes an account from it and
 * a review link; a referee with no cookies re-runs the check with the recorded seed (identical
 * numbers), downloads the bundle and files a report; a second re-run while one is going is
 * answered 429, and the referee cancels their own; the editor is told and releases the report;
 * the author reads it. Every wait is for a state on the page, never for a time: the re-run with
 * PACED_SEED starts and then waits until it is cancelled (the app's worker says so).
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { launchBrowser, type TestBrowser } from './browser';
import { seedReviewFlow, type ReviewFlowWorld } from './review-world';
import { startApp, type AppServer } from './server';
import { waitingWorker, type WaitingWorker } from '../waiting-worker';

// Safety limits for a busy machine (seeding bundles the verifier), not speed checks.
vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });
const STATE_WAIT = { timeout: 240_000 };

const editorEmail = 'harriet.vell@journal.example';
const PACED_SEED = 777;
let app: AppServer;
let worker: WaitingWorker | undefined;
let world: ReviewFlowWorld;
const browsers: TestBrowser[] = [];
let reviewUrl = '';

async function pageAs(session: string | null): Promise<Page> {
	const browser = await launchBrowser();
	browsers.push(browser);
	if (session)
		await browser.context.addCookies([
			{ name: 'rankseal_session', value: session, url: app.origin }
		]);
	return browser.context.newPage();
}

/** The text of the newest outbox message to `to` whose subject matches, read as the admin. */
async function newestMail(admin: Page, to: string, subject: RegExp): Promise<string> {
	await admin.goto(`${app.origin}/admin/outbox`);
	await admin
		.locator('[data-testid=outbox] li', { hasText: to })
		.filter({ hasText: subject })
		.first()
		.locator('a')
		.first()
		.click();
	return (await admin.textContent('[data-testid=message-text]')) ?? '';
}

beforeAll(async () => {
	world = await seedReviewFlow();
	// The real check worker, except that a re-run with PACED_SEED waits until it is cancelled.
	worker = await waitingWorker({ onlySeed: PACED_SEED });
	app = await startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_CHECK_WORKER: worker.file,
		RANKSEAL_CHECK_RETRY_AFTER_S: '30'
	});
});
afterAll(async () => {
	for (const browser of browsers) await browser.close();
	await app?.stop();
	worker?.remove();
});

describe('sharing and review in Chromium', () => {
	let author: Page, admin: Page, editor: Page;

	it('the author shares the certified claim with an editor', async () => {
		author = await pageAs(world.authorSession);
		await author.goto(`${app.origin}/claims/${world.claimId}`);
		await author.click('[data-testid=sharing-link]');
		await author.fill('input[name=email]', editorEmail);
		await author.fill('input[name=journal]', 'Journal of Invented Optics');
		await author.fill('input[name=manuscript]', 'JIO-2026-042');
		await author.click('[data-testid=share-button]');
		await author.locator('[data-testid=share]', { hasText: editorEmail }).waitFor(STATE_WAIT);
	});

	it('the editor opens the notice, makes an account from it and lands on the claim', async () => {
		admin = await pageAs(world.adminSession);
		const text = await newestMail(admin, editorEmail, /shared with you/);
		const link = text.match(/https?:\/\/\S+\/shared\/\S+/)?.[0];
		expect(link, `no share link in: ${text}`).toMatch(/\/shared\/shr_/);
		editor = await pageAs(null);
		await editor.goto(link!);
		await editor.fill('input[name=name]', 'Harriet Vell');
		await editor.fill('input[name=password]', 'an editor passphrase');
		await editor.click('[data-testid=editor-signup] button');
		await editor.waitForURL(/\/editor#claim-/);
		await expect(editor.locator('[data-testid=shared-claim]').textContent()).resolves.toContain(
			'JIO-2026-042'
		);
	});

	it('the editor makes a review link', async () => {
		await editor.fill('input[name=label]', 'Referee: Dr Quill');
		await editor.click('[data-testid=create-link]');
		const url = editor.locator('[data-testid=new-link-url]');
		await url.waitFor(STATE_WAIT);
		reviewUrl = (await url.textContent())!.trim();
		expect(reviewUrl).toMatch(/\/review\/rvw_[\w-]{43}$/);
	});

	it('a referee with no cookies re-runs the check with the recorded seed and gets identical numbers', async () => {
		const referee = await pageAs(null);
		expect(await referee.context().cookies()).toEqual([]);
		await referee.goto(reviewUrl);
		const seed = (await referee.textContent('[data-testid=recorded-seed]'))!.trim();
		await referee.click('[data-testid=rerun-button]');
		const done = referee.locator('[data-testid=rerun][data-status=done]');
		await done.waitFor(STATE_WAIT);
		await expect(done.textContent()).resolves.toContain(`Seed ${seed} (the recorded seed)`);
		const lower = await done.locator('[data-testid=rerun-lower]').textContent();
		expect(lower).toBe(world.certifiedLower.toFixed(6));
		await expect(done.locator('[data-testid=rerun-verdict]').textContent()).resolves.toContain(
			'Identical to the certificate'
		);

		const [download] = await Promise.all([
			referee.waitForEvent('download'),
			referee.click('[data-testid=bundle-link]')
		]);
		const bytes = readFileSync((await download.path())!);
		expect(createHash('sha256').update(bytes).digest('hex')).toBe(world.bundleSha256);

		await referee.check('input[name=recommendation][value=needs-revision]');
		await referee.fill('textarea[name=comments]', 'Please state the detector dead time.');
		await referee.click('[data-testid=file-report]');
		await referee.locator('[data-testid=report-state][data-state=submitted]').waitFor(STATE_WAIT);
	});

	it('a second re-run while one is going is answered 429; the referee cancels their own', async () => {
		const referee = await pageAs(null);
		const api = reviewUrl.replace('/review/', '/api/v1/review/');
		await referee.goto(reviewUrl);
		await referee.fill('input[name=seed]', String(PACED_SEED));
		await referee.click('[data-testid=rerun-button]');
		const going = referee.locator('[data-testid=rerun]', { hasText: `Seed ${PACED_SEED}` });
		await going.getByTestId('cancel-rerun').waitFor(STATE_WAIT);

		const [refused] = await Promise.all([
			referee.waitForResponse((r) => r.request().method() === 'POST' && /\?\/rerun/.test(r.url())),
			referee.click('[data-testid=rerun-button]')
		]);
		expect(refused.status()).toBe(429);
		expect(refused.headers()['retry-after']).toBe('30');
		const words = 'A re-run from this review link is still queued or running';
		await referee.getByRole('alert').filter({ hasText: words }).waitFor(STATE_WAIT);
		const viaApi = await fetch(`${api}/checks`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: '{}'
		});
		expect(viaApi.status).toBe(429);
		expect(viaApi.headers.get('retry-after')).toBe('30');
		expect((await viaApi.json()).error).toMatchObject({ code: 'rate_limited' });

		await referee.goto(reviewUrl);
		await going.getByRole('button', { name: 'Cancel this re-run' }).click();
		await going.getByTestId('rerun-cancelled').waitFor(STATE_WAIT);
		expect(await going.getAttribute('data-status')).toBe('cancelled');
		expect(await referee.getByTestId('cancel-rerun').count()).toBe(0);
		const view = await (await fetch(api)).json();
		const cancelled = view.checks.find((c: { seed: number }) => c.seed === PACED_SEED);
		expect(cancelled).toMatchObject({ status: 'cancelled', cancelledBy: 'the referee' });

		// The link's place is free again; a script cancels the same way.
		const again = await fetch(`${api}/checks`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ seed: PACED_SEED })
		});
		expect(again.status).toBe(202);
		const { id } = await again.json();
		const stopped = await fetch(`${api}/checks/${id}`, { method: 'DELETE' });
		expect(stopped.status).toBe(200);
		expect(await stopped.json()).toMatchObject({ id, status: 'cancelled' });
	});

	it('the editor is told, and releases the report', async () => {
		const text = await newestMail(admin, editorEmail, /filed a report/);
		expect(text).toContain('needs-revision');
		await editor.goto(`${app.origin}/editor`);
		await editor.locator('[data-testid=editor-report][data-state=submitted]').waitFor(STATE_WAIT);
		await editor.click('[data-testid=release-report]');
		await editor.locator('[data-testid=editor-report][data-state=released]').waitFor(STATE_WAIT);
	});

	it('the author then reads the report, without the referee’s label', async () => {
		await author.goto(`${app.origin}/claims/${world.claimId}/sharing`);
		const report = author.locator('[data-testid=released-report]');
		await report.waitFor(STATE_WAIT);
		await expect(report.textContent()).resolves.toContain('Please state the detector dead time.');
		await expect(author.content()).resolves.not.toContain('Dr Quill');
		const text = await newestMail(admin, world.authorEmail, /released/);
		expect(text).toContain(`/claims/${world.claimId}/sharing`);
	});

	it('a newer certificate while the link is open: the editor is told, the review page names both, /seal counts the analyses', async () => {
		await author.goto(`${app.origin}/claims/${world.claimId}/checks/${world.checkId}`);
		await author.click('[data-testid=issue-certificate] button');
		await author.waitForURL(/\/certificates\//, STATE_WAIT);
		const newer = author.url().split('/').at(-1)!;
		const text = await newestMail(admin, editorEmail, /under review has a new certificate/);
		expect(text).toContain(newer);
		const referee = await pageAs(null);
		await referee.goto(reviewUrl);
		const note = referee.locator('[data-testid=newer-certificate]');
		await note.waitFor(STATE_WAIT);
		await expect(note.textContent()).resolves.toContain(newer);
		// The referee's re-runs were not counted: the certificate is still the declared analysis alone.
		await referee.goto(`${app.origin}/seal/${newer}`);
		await expect(referee.textContent('[data-testid=seal-analyses]')).resolves.toContain(
			'1 distinct up to this certificate'
		);
	});
});
