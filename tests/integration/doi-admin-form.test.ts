/**
 * The "Try again now" form action of /admin/dois, called as Kit calls it against a real SQLite
 * file: someone not an admin is refused beside the form (403), a missing certificate is named as
 * the field at fault (400), an unknown one is a 404 page; nothing is changed by any of them.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isActionFailure, isHttpError } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AccountRole } from '../../src/lib/server/db/models/User';
import { asUser } from './actors';
import { addUser } from './backend-fixtures';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-doi-form-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';
process.env.DATACITE_FAKE_PORT = '0';

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const doiPage = await import('../../src/routes/(app)/admin/dois/+page.server');

let admin: string;
let researcher: string;

beforeAll(async () => {
	const { database } = await app();
	admin = await addUser(database, 'Eli Moss');
	researcher = await addUser(database, 'Bo Strand');
	await database.models.User.update({ accountRole: 'admin' }, { where: { id: admin } });
});
afterAll(async () => {
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

/** What the retry action answered: its failure, or the HttpError it threw. */
async function retry(userId: string, role: AccountRole, fields: Record<string, string>) {
	const form = new FormData();
	for (const [key, value] of Object.entries(fields)) form.set(key, value);
	const url = 'http://x.test/admin/dois?/retry';
	const event = {
		locals: { actor: asUser(userId, role), user: { id: userId }, session: null },
		url: new URL(url),
		params: {},
		request: new Request(url, { method: 'POST', body: form }),
		setHeaders: () => undefined
	};
	try {
		return await doiPage.actions.retry(event as never);
	} catch (thrown) {
		if (isHttpError(thrown)) return { thrown: thrown.status, message: thrown.body.message };
		throw thrown;
	}
}

describe('the retry form action', () => {
	it('refuses someone not an admin beside the form, whatever they name', async () => {
		// With a certificate named or none at all: who asks is checked before what they sent.
		const cases: Record<string, string>[] = [{ certificateId: 'c-1' }, {}];
		for (const fields of cases) {
			const answer = await retry(researcher, 'researcher', fields);
			expect(isActionFailure(answer)).toBe(true);
			expect(answer).toMatchObject({
				status: 403,
				data: { action: 'retry', errors: { '': 'Only admins may send a DOI registration again.' } }
			});
		}
	});

	it('names the missing certificate as the field at fault (400)', async () => {
		const answer = await retry(admin, 'admin', {});
		expect(answer).toMatchObject({
			status: 400,
			data: { errors: { certificateId: 'Name the certificate.' } }
		});
	});

	it('answers an unknown certificate with a 404', async () => {
		expect(await retry(admin, 'admin', { certificateId: 'no-such-certificate' })).toEqual({
			thrown: 404,
			message: 'No certificate has this DOI registration.'
		});
	});
});
