/**
 * One error mapping: each kind of service error gets one status and code (HTTP semantics per
 * RFC 9110 §15: 400, 401, 403, 404, 409, 413, 415; 429 per RFC 6585 §4), the same engine error
 * gets the same code on every endpoint, and every form action fails with the same keys.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isActionFailure, isHttpError, type RequestEvent } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { InputError } from '../../src/lib/certify';
import type { Actor } from '../../src/lib/server/core/actor';
import {
	ConflictError,
	FieldError,
	ForbiddenError,
	NotFoundError,
	RateLimitedError
} from '../../src/lib/server/core/errors';
import { problemOf } from '../../src/lib/server/http/problems';
import { asUser } from './actors';
import { addGroup, addUser, claimFields, countsCsv } from './backend-fixtures';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-problems-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const claimApi = await import('../../src/routes/api/v1/claims/[id]/+server');
const datasetsApi = await import('../../src/routes/api/v1/claims/[id]/datasets/+server');
const checksApi = await import('../../src/routes/api/v1/claims/[id]/checks/+server');
const claimPage = await import('../../src/routes/(app)/claims/[id]/+page.server');
const newClaim = await import('../../src/routes/(app)/claims/new/+page.server');
const groupList = await import('../../src/routes/(app)/group/+page.server');
const groupPage = await import('../../src/routes/(app)/group/[id]/+page.server');
const tokensPage = await import('../../src/routes/(app)/settings/tokens/+page.server');

let lead: Actor, author: Actor, outsider: Actor, groupId: string;
let claimId: string, bareClaimId: string;
const BAD_CSV = 'basis,outcome_a,outcome_b,counts\n0,0,0,10\n0,0,x,3\n';

beforeAll(async () => {
	const { database } = await app();
	groupId = await addGroup(database, 'Lake optics');
	const ridge = await addGroup(database, 'Ridge qudits');
	lead = asUser(await addUser(database, 'Ada Lind', [[groupId, 'lead']]));
	author = asUser(await addUser(database, 'Ben Osei', [[groupId, 'author']]));
	outsider = asUser(await addUser(database, 'Cyd Marsh', [[ridge, 'lead']]));
	claimId = (await createClaim(database, lead, claimFields)).id;
	bareClaimId = (await createClaim(database, lead, { ...claimFields, title: 'No counts' })).id;
});

afterAll(async () => {
	const services = await app();
	await services.mailCatcher?.close();
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

// The handlers read only these fields of the request event; each route types its own event.
function event(actor: Actor, url: string, init?: RequestInit, params = {}): never {
	// A text body is JSON unless the call says otherwise: JSON endpoints answer 415 to other types.
	const json = typeof init?.body === 'string' && !init.headers;
	const headers = json ? { 'content-type': 'application/json' } : undefined;
	const request = new Request(url, { method: 'POST', headers, ...init });
	const locals = { actor, user: null, session: null };
	return { locals, url: new URL(url), params, request } as never;
}

async function api(handler: (e: RequestEvent) => unknown, e: never) {
	const response = (await handler(e)) as Response;
	return { status: response.status, error: (await response.json()).error };
}

describe('the mapping of each kind of error', () => {
	const zodError = z.object({ seed: z.number() }).safeParse({ seed: 'x' }).error!;
	const table: [unknown, number, string][] = [
		[new NotFoundError(), 404, 'not_found'],
		[new ForbiddenError(), 403, 'forbidden'],
		[new FieldError('name', 'Name it.'), 400, 'bad_input'],
		[zodError, 400, 'bad_input'],
		[new InputError('bad cell', 3, 2), 400, 'bad_counts'],
		[new ConflictError('Not yet.'), 409, 'conflict'],
		[new RateLimitedError('Slow down.', 30), 429, 'rate_limited']
	];
	it.each(table)('%s → %i %s', (error, status, code) => {
		expect(problemOf(error)).toMatchObject({ status, code });
	});

	it('keeps the field and the place, and leaves unknown errors alone (a 500)', () => {
		expect(problemOf(zodError)).toMatchObject({ field: 'seed' });
		expect(problemOf(new InputError('bad cell', 3, 2))).toMatchObject({ line: 3, column: 2 });
		expect(problemOf(new Error('bug'))).toBeNull();
	});
});

describe('the same problem, the same code on every endpoint', () => {
	const at = (id: string, tail = '') => `http://localhost/api/v1/claims/${id}${tail}`;

	it('answers bad_counts with the line for a bad counts file, however it is sent', async () => {
		const form = new FormData();
		form.set('counts', new File([BAD_CSV], 'bad.csv'));
		const ways: RequestInit[] = [
			{ body: BAD_CSV, headers: { 'content-type': 'text/csv' } },
			{ body: form }
		];
		for (const init of ways) {
			const e = event(lead, at(claimId, '/datasets'), init, { id: claimId });
			expect(await api(datasetsApi.POST, e)).toMatchObject({
				status: 400,
				error: { code: 'bad_counts', line: 3, column: 3 }
			});
		}
		const json = {
			body: '{"dimension": 5, "tables": 7}',
			headers: { 'content-type': 'application/json' }
		};
		const e = event(lead, at(claimId, '/datasets'), json, { id: claimId });
		expect(await api(datasetsApi.POST, e)).toMatchObject({
			status: 400,
			error: { code: 'bad_counts' }
		});
	});

	it('answers bad_input naming the field for bad check settings', async () => {
		const body = JSON.stringify({ resamples: 5 });
		const e = event(lead, at(claimId, '/checks'), { body }, { id: claimId });
		expect(await api(checksApi.POST, e)).toMatchObject({
			status: 400,
			error: { code: 'bad_input', field: 'resamples' }
		});
	});

	it('answers 409 conflict for a check on a claim without counts', async () => {
		const e = event(lead, at(bareClaimId, '/checks'), { body: '{}' }, { id: bareClaimId });
		expect(await api(checksApi.POST, e)).toMatchObject({
			status: 409,
			error: { code: 'conflict', message: expect.stringMatching(/no counts file/) }
		});
	});

	it('answers not_found to a caller from outside on every claim endpoint', async () => {
		const answers = [
			await api(claimApi.GET, event(outsider, at(claimId), { method: 'GET' }, { id: claimId })),
			await api(
				datasetsApi.GET,
				event(outsider, at(claimId, '/datasets'), { method: 'GET' }, { id: claimId })
			),
			await api(
				datasetsApi.POST,
				event(
					outsider,
					at(claimId, '/datasets'),
					{ body: countsCsv(), headers: { 'content-type': 'text/csv' } },
					{ id: claimId }
				)
			),
			await api(
				checksApi.POST,
				event(outsider, at(claimId, '/checks'), { body: '{}' }, { id: claimId })
			)
		];
		for (const answer of answers)
			expect(answer).toMatchObject({ status: 404, error: { code: 'not_found' } });
	});
});

describe('every form action fails with the same keys', () => {
	const KEYS = ['action', 'errors', 'place', 'values'];
	const post = (fields: Record<string, string | File>) => {
		const body = new FormData();
		for (const [k, v] of Object.entries(fields)) body.set(k, v);
		return { body };
	};
	const failure = async (run: () => unknown) => {
		const result = await run();
		expect(isActionFailure(result)).toBe(true);
		return result as { status: number; data: Record<string, unknown> };
	};

	it('across claims, counts, checks, groups and tokens', async () => {
		const page = `http://localhost/claims/${claimId}`;
		const failures = [
			await failure(() =>
				claimPage.actions.upload(
					event(lead, page, post({ counts: new File([BAD_CSV], 'bad.csv') }), { id: claimId })
				)
			),
			await failure(() =>
				claimPage.actions.check(event(lead, page, post({ resamples: '5' }), { id: claimId }))
			),
			await failure(() =>
				claimPage.actions.check(
					event(lead, `http://localhost/claims/${bareClaimId}`, post({}), { id: bareClaimId })
				)
			),
			await failure(() =>
				newClaim.actions.create(event(lead, 'http://localhost/claims/new', post({ title: '' })))
			),
			await failure(() =>
				groupList.actions.create(event(lead, 'http://localhost/group', post({ name: 'x' })))
			),
			await failure(() =>
				groupPage.actions.invite(
					event(
						author,
						`http://localhost/group/${groupId}`,
						post({ email: 'a@b.test', role: 'author' }),
						{
							id: groupId
						}
					)
				)
			),
			await failure(() =>
				tokensPage.actions.create(
					event(lead, 'http://localhost/settings/tokens', post({ name: 'x', expiresInDays: '0' }))
				)
			)
		];
		expect(failures.map((f) => f.status)).toEqual([400, 400, 409, 400, 400, 403, 400]);
		for (const f of failures) expect(Object.keys(f.data).sort()).toEqual(KEYS);
		expect(failures[0].data).toMatchObject({ action: 'upload', place: { line: 3, column: 3 } });
		expect(failures[1].data.errors).toHaveProperty('resamples');
		expect(failures[6].data.errors).toHaveProperty('expiresInDays');
	});

	it('but something out of sight stays a 404 page', async () => {
		const page = `http://localhost/claims/${claimId}`;
		const thrown = await Promise.resolve(
			claimPage.actions.check(event(outsider, page, post({}), { id: claimId }))
		).catch((e: unknown) => e);
		expect(isHttpError(thrown) && thrown.status).toBe(404);
	});
});
