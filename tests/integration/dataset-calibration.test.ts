/**
 * A calibration uploaded beside the counts (witnesses.md §4.4), through the service: validated
 * against the claim (refusals name the field, nothing stored), used by the check worker, signed
 * into the certificate and carried in its bundle. The d = 3 example of issue 22: without its
 * calibration the counts certify Schmidt number ≥ 2 with a tolerance below 2 %, with it nothing.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { CALIBRATION_FILE } from '../../src/lib/evidence/layout';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset, listDatasets } from '../../src/lib/server/datasets/datasets';
import { FieldError } from '../../src/lib/server/core/errors';
import { addGroup, addUser, claimFields } from './backend-fixtures';
import { asUser } from './actors';
import { temporaryDatabase } from './db';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const counts = readFileSync('tests/fixtures/calibrated-d3-product.csv');
const calibration = readFileSync('tests/fixtures/calibrated-d3-bases.json');
let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let workerFolder: string;
let ada: string;

async function newClaim() {
	const fields = { ...claimFields, dimension: 3, bases: [0, 1, 2], claimedSchmidtNumber: 2 };
	return (await createClaim(ctx.database, asUser(ada), fields)).id;
}

async function checked(claimId: string) {
	const queued = await startCheck(ctx.database, asUser(ada), claimId, { resamples: 2000, seed: 5 });
	await (await startCheckRunner(ctx.database)).idle();
	return (await getCheck(ctx.database, asUser(ada), queued.id))!;
}

beforeAll(async () => {
	ctx = await temporaryDatabase();
	workerFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-cal-worker-'));
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.ORIGIN = 'https://rankseal.test';
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(
		path.join(workerFolder, 'check-worker.mjs')
	);
	const lake = await addGroup(ctx.database, 'Lake optics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'lead']]);
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
	rmSync(workerFolder, { recursive: true, force: true });
});

describe('a calibration uploaded beside the counts', () => {
	it('without it: Schmidt number ≥ 2, holding only for bases unbiased to within less than 2 %', async () => {
		const claimId = await newClaim();
		await addDataset(ctx.database, asUser(ada), claimId, { bytes: counts, originalName: 'd3.csv' });
		const check = await checked(claimId);
		expect(check.status).toBe('done');
		expect(check.result!.certifiedSchmidtNumber).toBe(2);
		expect(check.result!.calibrationTolerance!.value!).toBeLessThan(0.02);
	});

	it('with it: the check uses the measured overlaps, certifies nothing, and the bundle carries it', async () => {
		const claimId = await newClaim();
		const upload = { bytes: counts, originalName: 'd3.csv', calibration };
		const dataset = await addDataset(ctx.database, asUser(ada), claimId, upload);
		expect(dataset.calibrationSha256).toBe(sha256Hex(calibration));
		const check = await checked(claimId);
		expect(check.status).toBe('done');
		expect(check.result!.certifiedSchmidtNumber).toBe(1);
		expect(check.result!.calibration!.sha256).toBe(sha256Hex(calibration));
		const cert = await issueCertificate(ctx.database, asUser(ada), claimId, check.id);
		const zip = (await certificateFile(ctx.database, asUser(ada), cert.id, 'bundle')).bytes;
		const files = Object.fromEntries(
			Object.entries(readZip(zip)).map(([name, bytes]) => [name.replace(/^[^/]+\//, ''), bytes])
		);
		expect(sha256Hex(files[CALIBRATION_FILE])).toBe(sha256Hex(calibration));
		expect(verifyEvidence(files).valid).toBe(true);
	});

	it('refuses a calibration that does not fit the claim, naming the field; nothing is stored', async () => {
		const claimId = await newClaim();
		const bad = JSON.parse(calibration.toString());
		bad.bases[1].vectors[0][0][0] += 0.01;
		const upload = {
			bytes: counts,
			originalName: 'd3.csv',
			calibration: new TextEncoder().encode(JSON.stringify(bad))
		};
		const refusal = await addDataset(ctx.database, asUser(ada), claimId, upload).catch((e) => e);
		expect(refusal).toBeInstanceOf(FieldError);
		expect(refusal).toMatchObject({ field: 'calibration' });
		expect(refusal.message).toMatch(/calibration basis 1: not orthonormal/);
		const dropped = JSON.parse(calibration.toString());
		dropped.bases.pop();
		const missing = await addDataset(ctx.database, asUser(ada), claimId, {
			...upload,
			calibration: new TextEncoder().encode(JSON.stringify(dropped))
		}).catch((e) => e);
		expect(missing.message).toMatch(/basis 2 is used by the check but not calibrated/);
		expect(await listDatasets(ctx.database, asUser(ada), claimId)).toEqual([]);
	});
});
