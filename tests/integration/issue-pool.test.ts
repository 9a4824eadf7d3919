/**
 * Issue 16 part 1: issuing a certificate parses its counts and re-runs its check (the self-check)
 * on the work pool, not on the request thread. The self-check is held on its worker thread until
 * the test says `go` (tests/waiting-worker.ts), so a bystander's request is answered while the
 * issue waits: shown by order, never by time.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { UserActor } from '../../src/lib/server/core/actor';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { finishedCheck, type EvidenceWorld } from './evidence-world';
import { pacedTasks, waitingWorker } from '../waiting-worker';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-issue-pool-'));
const CHANNEL = `rankseal-issue-pool-${process.pid}`;
const worker = await waitingWorker({ held: { channel: CHANNEL, tasks: ['selfCheck'] } });
Object.assign(process.env, {
	RANKSEAL_DATA_DIR: path.join(folder, 'data'),
	ORIGIN: 'https://rankseal.test',
	MAIL_CATCHER_PORT: '0',
	RANKSEAL_CHECK_WORKER: worker.file
});

const { app, stopApp } = await import('../../src/lib/server/app/app');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const { addDataset } = await import('../../src/lib/server/datasets/datasets');
const { issueCertificate } = await import('../../src/lib/server/certificates/certificates');
const signingKeys = await import('../../src/routes/api/v1/signing-keys/+server');

const paced = pacedTasks(CHANNEL);
let world: EvidenceWorld;

beforeAll(async () => {
	const { database } = await app();
	const lake = await addGroup(database, 'Lake optics');
	const author = asUser(await addUser(database, 'Bo Strand', [[lake, 'lead']])) as UserActor;
	const claimId = (await createClaim(database, author, claimFields)).id;
	const dataset = await addDataset(database, author, claimId, {
		bytes: bytesOf(countsCsv(5, [0, 1, 2], 40_000, 11)),
		originalName: 'run3.csv'
	});
	world = { database, author, claimId, datasetId: dataset.id } as unknown as EvidenceWorld;
});

afterAll(async () => {
	paced.release();
	paced.close();
	await stopApp();
	rmSync(folder, { recursive: true, force: true });
	worker.remove();
});

describe('issuing on the work pool', () => {
	it('answers a bystander while the self-check waits on its thread, then issues', async () => {
		const check = await finishedCheck(world, 23);
		let issued = false;
		const issuing = issueCertificate(world.database, world.author, world.claimId, check.id).then(
			(certificate) => ((issued = true), certificate)
		);
		const first = await Promise.race([
			paced.whenStarted(1).then(() => 'held on a worker'),
			issuing.then(() => 'issued')
		]);
		expect(first, 'the certificate was issued before the bystander asked').toBe('held on a worker');
		const keys = (await signingKeys.GET({} as never)) as Response;
		expect(keys.status).toBe(200);
		expect(issued).toBe(false);
		paced.release();
		const certificate = await issuing;
		expect(certificate).toMatchObject({ status: 'valid', claimId: world.claimId });
	});
});
