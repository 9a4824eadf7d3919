/**
 * The one form-action runner and the rate limits inside the services, against a real SQLite file:
 * a form refused for too many requests answers 429 with Retry-After (the group invitation did
 * not), and the limit lives in the service, so the form and a direct service call (the path any
 * API or script takes) count against the same budget. 429 and Retry-After: RFC 6585 §4 and
 * RFC 9110 §10.2.3.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isActionFailure, isHttpError, isRedirect } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addGroup, addUser } from './backend-fixtures';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-form-actions-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';
// One attempt each per window: the second, by any path, is refused.
process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({
	invitations: { points: 1 },
	signUp: { points: 1 },
	resetRequest: { points: 1 },
	resendVerification: { points: 1 },
	sealLookup: { points: 1 }
});

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const { resetRateLimits } = await import('../../src/lib/server/core/rate-limits');
const { RateLimitedError } = await import('../../src/lib/server/core/errors');
const { apiProblem } = await import('../../src/lib/server/http/problems');
const { formRefused } = await import('../../src/lib/server/http/form-action');
const { inviteMember } = await import('../../src/lib/server/accounts/invitations');
const accounts = await import('../../src/lib/server/accounts/accounts');
const groupPage = await import('../../src/routes/(app)/group/[id]/+page.server');
const signupPage = await import('../../src/routes/(auth)/signup/+page.server');
const resetPage = await import('../../src/routes/(auth)/reset/+page.server');
const accountPage = await import('../../src/routes/(app)/account/+page.server');
const sealPage = await import('../../src/routes/seal/+page.server');
const { lookupFrom } = await import('../../src/lib/server/certificates/certificate-reads');

const ADDRESS = '203.0.113.41';
let lead: string, groupId: string;

const asUser = (userId: string) => ({
	kind: 'user',
	userId,
	accountRole: 'researcher',
	emailVerified: true
});

/** The fields of a request event the actions read; the headers they set are kept. */
function event(url: string, fields: Record<string, string>, userId: string | null = null) {
	const form = new FormData();
	for (const [key, value] of Object.entries(fields)) form.set(key, value);
	const headers: Record<string, string> = {};
	const locals = userId
		? { actor: asUser(userId), user: { id: userId }, session: null }
		: { actor: { kind: 'anonymous' }, user: null, session: null };
	const value = {
		locals,
		url: new URL(url),
		params: { id: groupId },
		request: new Request(url, { method: 'POST', body: form }),
		setHeaders: (set: Record<string, string>) => Object.assign(headers, set),
		getClientAddress: () => ADDRESS,
		cookies: { set: () => undefined }
	};
	return { event: value as never, headers };
}

async function outcome(run: () => unknown): Promise<unknown> {
	try {
		return await run();
	} catch (thrown) {
		return thrown;
	}
}

/** The action's failure status and the Retry-After it set. */
function refused(result: unknown, headers: Record<string, string>) {
	if (!isActionFailure(result)) throw new Error(`expected a failure, got ${String(result)}`);
	return { status: result.status, retryAfter: headers['retry-after'] };
}

beforeAll(async () => {
	resetRateLimits();
	const { database } = await app();
	groupId = await addGroup(database, 'Halvorsen Lake Photonics');
	lead = await addUser(database, 'Ingrid Halvorsen', [[groupId, 'lead']]);
});

afterAll(async () => {
	delete process.env.RANKSEAL_RATE_LIMITS;
	resetRateLimits();
	const services = await app();
	await services.mailCatcher?.close();
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

describe('group invitation', () => {
	const url = () => `http://localhost/group/${groupId}?/invite`;
	const invite = (email: string) => event(url(), { email, role: 'author' }, lead);

	it('answers the form over the limit with 429 and Retry-After', async () => {
		const first = invite('tove.aas@halvorsen.test');
		expect(isRedirect(await outcome(() => groupPage.actions.invite(first.event)))).toBe(true);
		const second = invite('odd.berg@halvorsen.test');
		const result = await outcome(() => groupPage.actions.invite(second.event));
		const { status, retryAfter } = refused(result, second.headers);
		expect(status).toBe(429);
		expect(Number(retryAfter)).toBeGreaterThan(0);
	});

	it('refuses the service itself once the form has used the budget', async () => {
		const { database } = await app();
		const input = { email: 'sigrid.lie@halvorsen.test', role: 'author' as const };
		const direct = inviteMember(database, asUser(lead) as never, groupId, input);
		await expect(direct).rejects.toBeInstanceOf(RateLimitedError);
	});
});

describe('sign-up, reset and resend', () => {
	it('limits sign-up per client address in the service: a direct call, then the form', async () => {
		const { database } = await app();
		const person = { email: 'kari.moe@halvorsen.test', name: 'Kari Moe', password: 'x'.repeat(16) };
		await accounts.signUp(database, person, { address: ADDRESS });
		const fields = { name: 'Per Nes', email: 'per.nes@halvorsen.test', password: 'y'.repeat(16) };
		const form = event('http://localhost/signup?/signup', fields);
		const result = await outcome(() => signupPage.actions.signup(form.event));
		expect(refused(result, form.headers).status).toBe(429);
		expect(Number(form.headers['retry-after'])).toBeGreaterThan(0);
	});

	it('limits reset requests per client address: the form, then a direct call', async () => {
		const first = event('http://localhost/reset?/request', { email: 'kari.moe@halvorsen.test' });
		expect(isRedirect(await outcome(() => resetPage.actions.request(first.event)))).toBe(true);
		const second = event('http://localhost/reset?/request', { email: 'per.nes@halvorsen.test' });
		const result = await outcome(() => resetPage.actions.request(second.event));
		expect(refused(result, second.headers)).toMatchObject({ status: 429 });
		const { database } = await app();
		const direct = accounts.requestPasswordReset(database, 'kari.moe@halvorsen.test', {
			address: ADDRESS
		});
		await expect(direct).rejects.toBeInstanceOf(RateLimitedError);
	});

	it('limits new confirmation links per account: the form, then a direct call', async () => {
		const { database } = await app();
		const reader = await addUser(database, 'Leif Dahl', [[groupId, 'author']]);
		const first = event('http://localhost/account?/resend', {}, reader);
		expect(isRedirect(await outcome(() => accountPage.actions.resend(first.event)))).toBe(true);
		const direct = accounts.resendVerification(database, asUser(reader) as never);
		await expect(direct).rejects.toBeInstanceOf(RateLimitedError);
		const third = event('http://localhost/account?/resend', {}, reader);
		const result = await outcome(() => accountPage.actions.resend(third.event));
		expect(refused(result, third.headers).status).toBe(429);
		expect(Number(third.headers['retry-after'])).toBeGreaterThan(0);
	});
});

describe('certificate look-up on /seal', () => {
	it('counts the page and a direct service call alike, per client address', async () => {
		const url = 'http://localhost/seal?q=0123456789abcdef';
		const first = event(url, {});
		expect(await sealPage.load(first.event)).toMatchObject({ lookup: { status: 'unknown' } });
		const { database } = await app();
		const direct = lookupFrom(database, '0123456789abcdef', ADDRESS);
		await expect(direct).rejects.toBeInstanceOf(RateLimitedError);
		const third = event(url, {});
		const refused = await outcome(() => sealPage.load(third.event));
		expect(isHttpError(refused) && refused.status).toBe(429);
		expect(Number(third.headers['retry-after'])).toBeGreaterThan(0);
	});
});

describe('a 429 that names no wait', () => {
	it('still carries Retry-After, in the API and beside a form', () => {
		const refusal = new RateLimitedError('Slow down.');
		expect(apiProblem(refusal).headers.get('retry-after')).toBe('1');
		const headers: Record<string, string> = {};
		const failure = formRefused({ setHeaders: (h) => Object.assign(headers, h) }, 'x', refusal);
		expect(failure.status).toBe(429);
		expect(headers['retry-after']).toBe('1');
	});
});
