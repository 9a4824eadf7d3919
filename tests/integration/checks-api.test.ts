/**
 * The check endpoints' fair-use answers: 429 with Retry-After over the limit (RFC 9110 §10.2.3
 * for the header, RFC 6585 §4 for the status), DELETE cancelling (200, then 409 Conflict).
 * The worker under test waits until aborted, so no check ends by itself.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Actor } from '../../src/lib/server/core/actor';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { waitingWorker } from '../waiting-worker';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-checks-api-'));
const worker = await waitingWorker({ announce: false });
Object.assign(process.env, {
	RANKSEAL_DATA_DIR: path.join(folder, 'data'),
	MAIL_CATCHER_PORT: '0',
	RANKSEAL_CHECK_WORKERS: '1',
	RANKSEAL_CHECK_WORKER: worker.file,
	RANKSEAL_CHECKS_PER_USER: '1',
	RANKSEAL_CHECK_RETRY_AFTER_S: '30'
});

const { app, stopApp } = await import('../../src/lib/server/app/app');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const { addDataset } = await import('../../src/lib/server/datasets/datasets');
const startApi = await import('../../src/routes/api/v1/claims/[id]/checks/+server');
const checkApi = await import('../../src/routes/api/v1/checks/[id]/+server');

let ada: Actor, cyd: Actor, claimId: string;

beforeAll(async () => {
	const { database } = await app();
	const lake = await addGroup(database, 'Lake optics');
	const ridge = await addGroup(database, 'Ridge qudits');
	ada = asUser(await addUser(database, 'Ada Lind', [[lake, 'lead']]));
	cyd = asUser(await addUser(database, 'Cyd Marsh', [[ridge, 'lead']]));
	claimId = (await createClaim(database, ada, claimFields)).id;
	await addDataset(database, ada, claimId, { bytes: bytesOf(countsCsv()), originalName: 'a.csv' });
});

afterAll(async () => {
	await stopApp();
	rmSync(folder, { recursive: true, force: true });
	worker.remove();
});

function event(actor: Actor, method: string, url: string, params: object, body?: unknown): never {
	const init =
		body === undefined
			? { method }
			: { method, body: JSON.stringify(body), headers: { 'content-type': 'application/json' } };
	const locals = { actor, user: null, session: null };
	const full = `http://localhost${url}`;
	return { locals, url: new URL(full), params, request: new Request(full, init) } as never;
}

async function answer(handler: (e: RequestEvent) => unknown, e: never) {
	const response = (await handler(e)) as Response;
	return { status: response.status, headers: response.headers, body: await response.json() };
}

describe('check endpoints', () => {
	it('answers 429 rate_limited with Retry-After over the per-person limit, and DELETE cancels (then 409)', async () => {
		const url = `/api/v1/claims/${claimId}/checks`;
		const first = await answer(startApi.POST, event(ada, 'POST', url, { id: claimId }, {}));
		expect(first.status).toBe(202);
		const second = await answer(startApi.POST, event(ada, 'POST', url, { id: claimId }, {}));
		expect(second.status).toBe(429);
		expect(second.headers.get('retry-after')).toBe('30');
		expect(second.body.error).toMatchObject({ code: 'rate_limited' });
		expect(second.body.error.message).toMatch(/the limit is 1 per person/);

		const at = `/api/v1/checks/${first.body.id}`;
		const params = { id: first.body.id };
		const hidden = await answer(checkApi.DELETE, event(cyd, 'DELETE', at, params));
		expect(hidden).toMatchObject({ status: 404, body: { error: { code: 'not_found' } } });
		const cancelled = await answer(checkApi.DELETE, event(ada, 'DELETE', at, params));
		expect(cancelled.status).toBe(200);
		expect(cancelled.body).toMatchObject({ status: 'cancelled', cancelledBy: 'Ada Lind' });
		const again = await answer(checkApi.DELETE, event(ada, 'DELETE', at, params));
		expect(again).toMatchObject({ status: 409, body: { error: { code: 'conflict' } } });
		const read = await answer(checkApi.GET, event(ada, 'GET', at, params));
		expect(read.body).toMatchObject({ status: 'cancelled', result: null });

		// The slot is free again: the same person may start the next check.
		const third = await answer(startApi.POST, event(ada, 'POST', url, { id: claimId }, {}));
		expect(third.status).toBe(202);
		const end = { id: third.body.id };
		const cleanup = event(ada, 'DELETE', `/api/v1/checks/${third.body.id}`, end);
		expect((await answer(checkApi.DELETE, cleanup)).status).toBe(200);
	});
});
