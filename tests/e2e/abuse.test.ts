/**
 * Sign-in and mail abuse against the built app (issue 10), with small limits named here: the
 * sequence of answers (400, then 429 with Retry-After and words saying when), the same answer to
 * a sign-up or reset whether or not the address has an account, and review links that do not
 * open. Nothing waits for a time: the pauses are longer than the test, so each answer is fixed.
 * 429 and Retry-After: RFC 6585 §4 and RFC 9110 §10.2.3.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../src/lib/server/accounts/auth';
import { openDatabase } from '../../src/lib/server/db';
import { newId } from '../../src/lib/server/core/ids';
import { startApp, type AppServer } from './server';

let app: AppServer;
let dataDir: string;
const password = 'a long test passphrase 10';
const email = 'ines.park@example.test';

const LIMITS = {
	signInAccountAddress: { free: 2, cap: 50, firstDelaySeconds: 600 },
	signInAddress: { free: 100, cap: 500 },
	signUp: { points: 4 },
	resetRequest: { points: 3 },
	reviewRefused: { free: 2, cap: 50, firstDelaySeconds: 900 }
};

beforeAll(async () => {
	dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-abuse-'));
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	await database.models.User.create({
		id: newId(),
		email,
		name: 'Ines Park',
		passwordHash: await hashPassword(password),
		accountRole: 'researcher',
		emailVerifiedAt: new Date()
	});
	await database.sequelize.close();
	const env = { RANKSEAL_DATA_DIR: dataDir, RANKSEAL_RATE_LIMITS: JSON.stringify(LIMITS) };
	app = await startApp(env);
});

afterAll(async () => {
	await app?.stop();
	if (dataDir) rmSync(dataDir, { recursive: true, force: true });
});

function postForm(route: string, fields: Record<string, string>) {
	return fetch(app.origin + route, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			origin: app.origin,
			accept: 'text/html',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams(fields)
	});
}

/** The visible text of the form's problem line. */
const problemLine = (html: string) =>
	html
		.match(/<p role="alert"[^>]*>([^<]*)<\/p>/)?.[1]
		.trim()
		.replace(/\s+/g, ' ') ?? '';

describe('sign-in', () => {
	it('answers 400 twice, then pauses (saying when), then 429 with Retry-After, even for the right password', async () => {
		const answers = [];
		for (const guess of ['wrong one', 'wrong two', 'wrong three', password]) {
			const response = await postForm('/login?/login', { email, password: guess });
			const retryAfter = response.headers.get('retry-after');
			answers.push({
				status: response.status,
				retryAfter,
				words: problemLine(await response.text())
			});
		}
		const mismatch = 'That address and password do not match an account.';
		expect(answers[0]).toEqual({ status: 400, retryAfter: null, words: mismatch });
		expect(answers[1]).toEqual({ status: 400, retryAfter: null, words: mismatch });
		expect(answers[2].status).toBe(400);
		expect(answers[2].words).toMatch(
			/^That address .* Try again in 10 minutes \(at \d\d:\d\d:\d\d UTC\)\.$/
		);
		expect(answers[3].status).toBe(429);
		expect(Number(answers[3].retryAfter)).toBeGreaterThan(0);
		expect(Number(answers[3].retryAfter)).toBeLessThanOrEqual(600);
		expect(answers[3].words).toMatch(
			/^Too many failed sign-ins for this account from your network address\. Try again in/
		);
	});

	it('keeps another account open from the same address', async () => {
		const response = await postForm('/login?/login', {
			email: 'someone.else@example.test',
			password: 'wrong'
		});
		expect(response.status).toBe(400);
	});
});

describe('sign-up and reset answer alike', () => {
	it('gives a taken and a new address the same redirect and the same page', async () => {
		const answer = async (address: string) => {
			const fields = { name: 'Test Person', email: address, password: 'another long passphrase' };
			const response = await postForm('/signup?/signup', fields);
			const location = response.headers.get('location')!;
			const page = await (await fetch(app.origin + location)).text();
			const words = page.match(/data-testid="signup-sent"[^>]*>([^<]*)</)?.[1].trim();
			return {
				status: response.status,
				location,
				cookie: response.headers.has('set-cookie'),
				words
			};
		};
		const taken = await answer(email);
		const fresh = await answer('brand.new@example.test');
		expect(taken).toEqual(fresh);
		expect(fresh).toMatchObject({
			status: 303,
			location: '/signup?sent=1&next=%2Fgroup',
			cookie: false
		});
		expect(fresh.words).toMatch(/^Thank you\. We have written to the address you gave/);
	});

	it('counts sign-ups per client address and refuses the fifth with 429', async () => {
		const statuses = [];
		for (let i = 0; i < 3; i++) {
			const fields = {
				name: 'P',
				email: `p${i}@example.test`,
				password: 'another long passphrase'
			};
			const response = await postForm('/signup?/signup', fields);
			statuses.push(response.status);
			if (response.status === 429) {
				expect(Number(response.headers.get('retry-after'))).toBeGreaterThan(0);
				expect(problemLine(await response.text())).toMatch(/^Too many sign-ups .* Try again in/);
			}
		}
		// Two were used by the test above: 4 allowed in all.
		expect(statuses).toEqual([303, 303, 429]);
	});

	it('answers a reset alike for a known and an unknown address, then 429', async () => {
		const known = await postForm('/reset?/request', { email });
		const unknown = await postForm('/reset?/request', { email: 'nobody@example.test' });
		expect([known.status, known.headers.get('location')]).toEqual([303, '/reset?sent=1']);
		expect([unknown.status, unknown.headers.get('location')]).toEqual([303, '/reset?sent=1']);
		await postForm('/reset?/request', { email });
		const refused = await postForm('/reset?/request', { email });
		expect(refused.status).toBe(429);
		expect(refused.headers.get('retry-after')).toMatch(/^\d+$/);
	});
});

describe('review links that do not open', () => {
	it('answers 404 (the third starts a pause), then 429 (problem JSON, Retry-After), API and page', async () => {
		const api = [];
		for (let i = 0; i < 4; i++) {
			const response = await fetch(`${app.origin}/api/v1/review/rvw_guess${i}`);
			api.push({ status: response.status, code: (await response.json()).error?.code });
		}
		expect(api.map((a) => a.status)).toEqual([404, 404, 404, 429]);
		expect(api.map((a) => a.code)).toEqual(['not_found', 'not_found', 'not_found', 'rate_limited']);
		const again = await fetch(`${app.origin}/api/v1/review/rvw_guess9`);
		const retryAfter = Number(again.headers.get('retry-after'));
		expect(retryAfter).toBeGreaterThan(0);
		expect(retryAfter).toBeLessThanOrEqual(900);
		const page = await fetch(`${app.origin}/review/rvw_guess10`, {
			headers: { accept: 'text/html' }
		});
		expect(page.status).toBe(429);
		expect(page.headers.get('retry-after')).toMatch(/^\d+$/);
		expect(await page.text()).toContain('Too many requests through this link');
	});
});
