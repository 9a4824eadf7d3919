/**
 * Every `page` and `pageSize` of a list, page or API goes through one schema (src/lib/paging.ts):
 * a number SQLite cannot take as an OFFSET (1e20 → `OFFSET 5e+21`), an infinite or a fractional
 * one is a 400 naming the field, never a 500. Pages and the API are called as Kit would call
 * them, against a real SQLite file.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isHttpError } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asUser } from './actors';
import { addUser } from './backend-fixtures';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-paging-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const outboxPage = await import('../../src/routes/(app)/admin/outbox/+page.server');
const doiPage = await import('../../src/routes/(app)/admin/dois/+page.server');
const claimList = await import('../../src/routes/(app)/claims/+page.server');
const ledgerApi = await import('../../src/routes/api/v1/ledger/+server');
const claimsApi = await import('../../src/routes/api/v1/claims/+server');

let admin: string;
const BAD = ['1e20', '1e308', 'Infinity', '-1', '0', '2.5', 'abc'];

beforeAll(async () => {
	const { database } = await app();
	admin = await addUser(database, 'Outbox Admin');
	await database.models.User.update({ accountRole: 'admin' }, { where: { id: admin } });
});
afterAll(async () => {
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

function event(url: string) {
	const actor = asUser(admin, 'admin');
	const locals = { actor, user: { id: admin }, session: null };
	return { locals, url: new URL(url), params: {} } as never;
}

/** What a page load threw, as Kit's HttpError status and message. */
async function pageAnswer(load: (e: never) => unknown, url: string) {
	try {
		await load(event(url));
		return { status: 200, message: '' };
	} catch (thrown) {
		if (!isHttpError(thrown)) throw thrown;
		return { status: thrown.status, message: thrown.body.message };
	}
}

async function apiAnswer(handler: (e: never) => Promise<Response>, url: string) {
	const response = await handler(event(url));
	const body = await response.json();
	return { status: response.status, field: body.error?.field, message: body.error?.message };
}

describe('page numbers', () => {
	it.each(BAD)('the admin outbox answers ?page=%s with a 400 naming the page', async (bad) => {
		const answer = await pageAnswer(
			outboxPage.load as never,
			`http://x.test/admin/outbox?page=${bad}`
		);
		expect(answer.status).toBe(400);
		expect(answer.message).toMatch(/^page: The page must be/);
	});

	it.each(BAD)('the admin DOI page answers ?page=%s with a 400 naming the page', async (bad) => {
		const answer = await pageAnswer(doiPage.load as never, `http://x.test/admin/dois?page=${bad}`);
		expect(answer).toMatchObject({ status: 400, message: expect.stringMatching(/^page: /) });
	});

	it.each(BAD)('the claims page answers ?page=%s with a 400 naming the page', async (bad) => {
		const answer = await pageAnswer(claimList.load as never, `http://x.test/claims?page=${bad}`);
		expect(answer).toMatchObject({ status: 400, message: expect.stringMatching(/^page: /) });
	});

	it.each(BAD)(
		'the ledger API answers ?page=%s and ?pageSize=%s with 400 naming each',
		async (bad) => {
			const page = await apiAnswer(
				ledgerApi.GET as never,
				`http://x.test/api/v1/ledger?page=${bad}`
			);
			expect(page).toMatchObject({ status: 400, field: 'page' });
			const size = await apiAnswer(
				ledgerApi.GET as never,
				`http://x.test/api/v1/ledger?pageSize=${bad}`
			);
			expect(size).toMatchObject({ status: 400, field: 'pageSize' });
		}
	);

	it.each(BAD)(
		'the claims API answers ?pageSize=%s with a 400 naming the page size',
		async (bad) => {
			const answer = await apiAnswer(
				claimsApi.GET as never,
				`http://x.test/api/v1/claims?pageSize=${bad}`
			);
			expect(answer).toMatchObject({ status: 400, field: 'pageSize' });
		}
	);

	it('still answers the last allowed page (empty) and a blank page as the first', async () => {
		const last = await apiAnswer(
			ledgerApi.GET as never,
			'http://x.test/api/v1/ledger?page=1000000'
		);
		expect(last.status).toBe(200);
		expect(await pageAnswer(outboxPage.load as never, 'http://x.test/admin/outbox?page=')).toEqual({
			status: 200,
			message: ''
		});
		const lastDois = 'http://x.test/admin/dois?page=1000000&status=failed';
		expect(await pageAnswer(doiPage.load as never, lastDois)).toEqual({ status: 200, message: '' });
	});
});
