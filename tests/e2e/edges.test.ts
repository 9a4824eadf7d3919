/**
 * Edges of the built app (issue 7 §4): open redirects after normalisation, control characters
 * in ids, queries and cookies, a JSON counts file nested 100 000 deep, and the session cookie's
 * path when lucia renews it.
 */
import { rmSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword, sessionKey } from '../../src/lib/server/accounts/auth';
import { openDatabase } from '../../src/lib/server/db';
import { newId } from '../../src/lib/server/core/ids';
import { seedApiWorld, type ApiWorld } from './api-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
/** A session close to expiry, which lucia renews (sets the cookie again) on the next request. */
let ageingSession: string;
const password = 'a long test passphrase 7';
const email = 'nell@example.test';

beforeAll(async () => {
	world = await seedApiWorld();
	const database = await openDatabase(path.join(world.dataDir, 'rankseal.sqlite'));
	const userId = newId();
	await database.models.User.create({
		id: userId,
		email,
		name: 'Nell Ames',
		passwordHash: await hashPassword(password),
		accountRole: 'researcher',
		emailVerifiedAt: new Date()
	});
	ageingSession = newId().replaceAll('-', '');
	const inOneDay = new Date(Date.now() + 86_400_000);
	await database.models.Session.create({
		id: sessionKey(ageingSession),
		userId,
		expiresAt: inOneDay
	});
	await database.sequelize.close();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
});

afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

const get = (route: string, cookie?: string) =>
	fetch(app.origin + route, { redirect: 'manual', headers: cookie ? { cookie } : {} });
const signedIn = () => `rankseal_session=${world.session}`;

function postForm(route: string, fields: Record<string, string>) {
	return fetch(app.origin + route, {
		method: 'POST',
		redirect: 'manual',
		// As a browser without JavaScript posts it (Kit answers JSON to other callers).
		headers: {
			origin: app.origin,
			accept: 'text/html',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams(fields)
	});
}

// Each of these normalises (WHATWG URL, RFC 3986 §5.2.4 dot-segment removal) or is read by
// browsers as a path to another host; all must land on our own fallback page.
const HOSTILE_NEXT = [
	'/.//evil.example',
	'/..//evil.example',
	'/%2e%2e//evil.example',
	'/%2E//evil.example/x',
	'/./\\evil.example',
	'/\\/evil.example',
	'//evil.example',
	'https://evil.example/'
];

describe('after sign-in, only same-origin paths', () => {
	it('ignores a hostile ?next= on the sign-in and sign-up pages of a signed-in user', async () => {
		for (const next of HOSTILE_NEXT)
			for (const page of ['/login', '/signup']) {
				const response = await get(`${page}?next=${encodeURIComponent(next)}`, signedIn());
				expect(response.status, `${page} ${next}`).toBe(303);
				expect(response.headers.get('location'), `${page} ${next}`).toMatch(/^\/[a-z]/);
			}
	});

	it('ignores a hostile next after signing in and after signing up', async () => {
		for (const next of HOSTILE_NEXT) {
			const login = await postForm('/login?/login', { email, password, next });
			expect(login.status, next).toBe(303);
			expect(login.headers.get('location'), next).toBe('/claims');
		}
		const signup = await postForm('/signup?/signup', {
			name: 'Orla Penn',
			email: 'orla@example.test',
			password,
			next: '/.//evil.example'
		});
		// No session before the address is confirmed; the hostile next became our own fallback.
		expect(signup.status).toBe(303);
		expect(signup.headers.get('location')).toBe('/signup?sent=1&next=%2Fgroup');
		// A same-origin path still works.
		const fine = await postForm('/login?/login', { email, password, next: '/claims?q=x' });
		expect(fine.headers.get('location')).toBe('/claims?q=x');
	});
});

describe('control characters', () => {
	it('answers 400 or 404, never 500, for NUL and other control characters', async () => {
		const token = { authorization: `Bearer ${world.tokens.lake}` };
		for (const route of ['/api/v1/claims/a%00b', '/api/v1/checks/a%01b', '/api/v1/claims?q=%00']) {
			const response = await fetch(app.origin + route, { headers: token });
			expect([400, 404], route).toContain(response.status);
			expect((await response.json()).error.code, route).toBeTruthy();
		}
		for (const route of ['/claims?q=%00', '/claims/a%00b', '/claims?q=a%0Db']) {
			const response = await get(route, signedIn());
			expect([400, 404], route).toContain(response.status);
		}
	});

	it('treats a session cookie with a NUL as no session, on every page', async () => {
		for (const route of ['/', '/claims', '/login']) {
			const response = await get(route, 'rankseal_session=a%00b');
			expect(response.status, route).not.toBe(500);
			expect(response.status, route).toBeLessThan(400);
		}
		const home = await get('/', 'rankseal_session=a%00b');
		expect(home.headers.get('set-cookie') ?? '').toMatch(/rankseal_session=;.*Max-Age=0/i);
	});
});

describe('JSON counts nested 100 000 deep', () => {
	it('answers 400 bad_counts naming the line, not a crash', async () => {
		const headers = {
			authorization: `Bearer ${world.tokens.lake}`,
			'content-type': 'application/json'
		};
		const created = await fetch(`${app.origin}/api/v1/claims`, {
			method: 'POST',
			headers,
			body: JSON.stringify({
				title: 'Deep file',
				sourceDescription: 'a hostile upload',
				dimension: 5,
				method: 'mub-correlation',
				claimedSchmidtNumber: 2
			})
		});
		expect(created.status).toBe(201);
		const claim = (await created.json()) as { id: string };
		const body = '{"dimension": 5, "tables": ' + '['.repeat(100_000) + ']'.repeat(100_000) + '}';
		const response = await fetch(`${app.origin}/api/v1/claims/${claim.id}/datasets`, {
			method: 'POST',
			headers,
			body
		});
		expect(response.status).toBe(400);
		const problem = (await response.json()).error;
		expect(problem.code).toBe('bad_counts');
		expect(problem.line).toBe(1);
		// The server still answers afterwards.
		expect((await get('/')).status).toBe(200);
	});
});

describe('one session cookie path', () => {
	it('renews an ageing session with Path=/', async () => {
		const response = await get('/claims', `rankseal_session=${ageingSession}`);
		const cookie = response.headers.get('set-cookie') ?? '';
		expect(cookie).toContain(`rankseal_session=${ageingSession}`);
		expect(cookie).toMatch(/Path=\/(;|$)/);
	});
});
