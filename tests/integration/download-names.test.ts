/**
 * A counts file named by its uploader ("données 😀.csv", a line separator, a bidi override) is
 * stored tidied and downloaded with a Content-Disposition a header can hold: an ASCII filename
 * and the exact name in filename* (RFC 6266, RFC 8187). fetch's Headers refuses any character
 * above U+00FF, which made such a download a 500. The route is called as Kit calls it.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { doneCheck } from '../e2e/matrix-parts';
import { asUser } from './actors';
import { addGroup, addUser } from './backend-fixtures';
import { GOOD_CSV } from './hostile-counts';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-download-names-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const { addDataset } = await import('../../src/lib/server/datasets/datasets');
const countsRoute =
	await import('../../src/routes/(app)/claims/[id]/checks/[checkId]/counts/+server');

afterAll(async () => {
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

let author: ReturnType<typeof asUser>;
beforeAll(async () => {
	const { database } = await app();
	const groupId = await addGroup(database, 'Halvorsen Lake Photonics');
	author = asUser(await addUser(database, 'Nora Name', [[groupId, 'lead']]));
});

async function download(originalName: string) {
	const { database } = await app();
	const claim = await createClaim(database, author, {
		...{ title: `Names ${originalName.length}`, sourceDescription: 'SPDC', dimension: 5 },
		...{ method: 'mub-correlation', bases: [0, 1, 2], claimedSchmidtNumber: 3 }
	});
	const bytes = new TextEncoder().encode(GOOD_CSV + `# ${originalName.length}\n`);
	const dataset = await addDataset(database, author, claim.id, { bytes, originalName });
	const checkId = await doneCheck(database, claim.id, dataset.id, author.userId);
	const event = { locals: { actor: author }, params: { id: claim.id, checkId } };
	return { dataset, response: await countsRoute.GET(event as never) };
}

describe('a counts file with an odd name', () => {
	it('downloads with an ASCII filename and the exact stored name in filename*', async () => {
		const { dataset, response } = await download('données 😀.csv');
		expect(response.status).toBe(200);
		const disposition = response.headers.get('content-disposition')!;
		expect(disposition).toMatch(/^attachment; filename="donn_es __\.csv"; filename\*=UTF-8''/);
		expect(decodeURIComponent(disposition.split("filename*=UTF-8''")[1])).toBe(
			dataset.originalName
		);
	});

	it('is stored with line breaks, controls and bidi overrides made visible as "_"', async () => {
		const { dataset, response } = await download('run\u2028three\u202e\r\n.csv');
		expect(dataset.originalName).toBe('run_three___.csv');
		expect(response.status).toBe(200);
	});
});
