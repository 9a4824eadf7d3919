/** The token endpoints: a signed-in person issues, lists and revokes; a token may do none of it. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Actor } from '../../src/lib/server/core/actor';
import { asUser } from './actors';
import { addGroup, addUser } from './backend-fixtures';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-tokens-api-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const { authenticate } = await import('../../src/lib/server/accounts/tokens');
const tokensApi = await import('../../src/routes/api/v1/tokens/+server');
const tokenApi = await import('../../src/routes/api/v1/tokens/[id]/+server');

let editor: Actor, outsider: Actor;
const DAY_MS = 24 * 60 * 60 * 1000;

beforeAll(async () => {
	const { database } = await app();
	const lake = await addGroup(database, 'Lake optics');
	const eda = await addUser(database, 'Eda Kern', [], 'editor');
	editor = asUser(eda, 'editor');
	outsider = asUser(await addUser(database, 'Ada Lind', [[lake, 'lead']]));
});

afterAll(async () => {
	const services = await app();
	await services.mailCatcher?.close();
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

function event(actor: Actor, method: string, body?: unknown, params = {}): never {
	const url = 'http://localhost/api/v1/tokens';
	const headers = { 'content-type': 'application/json' };
	const init = body === undefined ? { method } : { method, headers, body: JSON.stringify(body) };
	const locals = { actor, user: null, session: null };
	return { locals, url: new URL(url), params, request: new Request(url, init) } as never;
}

async function answer(handler: (e: RequestEvent) => unknown, e: never) {
	const response = (await handler(e)) as Response;
	return { status: response.status, body: response.status === 204 ? null : await response.json() };
}

describe('token endpoints', () => {
	it('issues an editor a token with the chosen expiry, lists it, and revokes it', async () => {
		const before = Date.now();
		const created = await answer(
			tokensApi.POST,
			event(editor, 'POST', { name: 'desk', expiresInDays: 30 })
		);
		expect(created.status).toBe(201);
		expect(created.body.token).toMatch(/^rks_/);
		const expires = new Date(created.body.expiresAt).getTime();
		expect(expires).toBeGreaterThanOrEqual(before + 30 * DAY_MS);
		expect(expires).toBeLessThanOrEqual(Date.now() + 30 * DAY_MS);
		const listed = await answer(tokensApi.GET, event(editor, 'GET'));
		expect(listed.body.map((t: { id: string }) => t.id)).toEqual([created.body.id]);

		// Another person is told the token does not exist; its owner revokes it.
		const params = { id: created.body.id };
		expect(
			(await answer(tokenApi.DELETE, event(outsider, 'DELETE', undefined, params))).body.error
		).toMatchObject({ code: 'not_found' });
		expect((await answer(tokenApi.DELETE, event(editor, 'DELETE', undefined, params))).status).toBe(
			204
		);
		const { database } = await app();
		expect(await authenticate(database, created.body.token)).toBeNull();
	});

	it('refuses a token acting on tokens (403) and a bad expiry (400 bad_input)', async () => {
		const { database } = await app();
		const created = await answer(tokensApi.POST, event(editor, 'POST', { name: 'robot' }));
		const robot = (await authenticate(database, created.body.token))!;
		expect(await answer(tokensApi.GET, event(robot, 'GET'))).toMatchObject({
			status: 403,
			body: { error: { code: 'forbidden' } }
		});
		expect(
			await answer(tokensApi.POST, event(editor, 'POST', { name: 'x', expiresInDays: 0 }))
		).toMatchObject({
			status: 400,
			body: { error: { code: 'bad_input', field: 'expiresInDays' } }
		});
	});
});
