/**
 * The start-up sweep of uploaded files (issue 10, faults): what a killed upload or a restored
 * backup leaves under files/ — a `.part` file, bytes renamed into place whose transaction never
 * committed, a stray file in the wrong folder — goes; the stored bytes of every row stay; a row
 * whose file has vanished is named, not hidden.
 */
import { existsSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { sweepUploadFiles } from '../../src/lib/server/storage/counts-sweep';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { asUser } from './actors';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let ada: string;

beforeAll(async () => {
	ctx = await temporaryDatabase();
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	const lake = await addGroup(ctx.database, 'Lake optics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
});

const put = (relative: string, text: string) => {
	const file = path.join(ctx.folder, 'files', relative);
	mkdirSync(path.dirname(file), { recursive: true });
	writeFileSync(file, text);
};

describe('upload sweep', () => {
	it('removes temporary and unowned files, keeps stored bytes, names missing ones', async () => {
		const claimId = (await createClaim(ctx.database, asUser(ada), claimFields)).id;
		const kept = await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(countsCsv()),
			originalName: 'kept.csv'
		});
		const gone = await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(countsCsv() + '# another run\n'),
			originalName: 'gone.csv'
		});
		rmSync(datasetFilePath(gone.sha256));
		const orphan = sha256Hex(bytesOf('renamed, never committed'));
		const strays = [
			path.join(kept.sha256.slice(0, 2), `${kept.sha256}.a1b2c3d4e5f6.part`),
			path.join(orphan.slice(0, 2), orphan),
			// The right name in the wrong folder is not the stored copy either.
			path.join('00', kept.sha256)
		];
		for (const stray of strays) put(stray, 'left behind');
		const sweep = await sweepUploadFiles(ctx.database);
		expect(sweep.removed.sort()).toEqual(strays.map((s) => path.join('files', s)).sort());
		expect(sweep.missing).toEqual([path.join('files', gone.sha256.slice(0, 2), gone.sha256)]);
		expect(existsSync(datasetFilePath(kept.sha256))).toBe(true);
		// A second sweep finds nothing more to do.
		expect((await sweepUploadFiles(ctx.database)).removed).toEqual([]);
	});
});
