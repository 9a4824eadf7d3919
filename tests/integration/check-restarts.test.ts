/**
 * A check that keeps cutting the server short is not queued again forever (issue 10: "running
 * checks are re-queued or marked failed with the reason"). Against a real SQLite file and real
 * worker threads; the worker under test reports "started" and then waits until it is aborted,
 * so nothing here depends on how fast a check runs.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cutOffReason } from '../../src/lib/server/checks/left-behind';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { CheckRunner } from '../../src/lib/server/checks/runner';
import type { CheckStatus } from '../../src/lib/server/db/models/Check';
import { MAX_CHECK_STARTS } from '../../src/lib/server/checks/check-limits';
import { getCheck } from '../../src/lib/server/checks/checks';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { newId } from '../../src/lib/server/core/ids';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { temporaryDatabase } from './db';
import { waitingWorker, type WaitingWorker } from '../waiting-worker';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let worker: WaitingWorker;
let ada: string, claimId: string, datasetId: string;
const saved = { ...process.env };

beforeAll(async () => {
	ctx = await temporaryDatabase();
	worker = await waitingWorker();
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.RANKSEAL_CHECK_WORKER = worker.file;
	const lake = await addGroup(ctx.database, 'Lake optics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'lead']]);
	claimId = (await createClaim(ctx.database, asUser(ada), claimFields)).id;
	const bytes = bytesOf(countsCsv(5, [0, 1], 50_000, 1));
	datasetId = (
		await addDataset(ctx.database, asUser(ada), claimId, { bytes, originalName: 'a.csv' })
	).id;
	// The upload started this process's runner; each test starts its own, as a new process would.
	await stopCheckRunner(ctx.database);
});

afterAll(async () => {
	await ctx.close();
	worker?.remove();
	process.env = saved;
});

/** A check row as a previous process left it. */
async function leftBehind(status: CheckStatus, attempts: number): Promise<string> {
	const id = newId();
	await ctx.database.models.Check.create({
		...{ id, claimId, datasetId, createdBy: ada, status, attempts },
		...{ progress: 0.4, resamples: 1000, confidence: 0.99865, seed: 5, startedAt: new Date() }
	});
	return id;
}

const row = async (id: string) =>
	(await ctx.database.models.Check.findByPk(id))!.get({ plain: true });

/** Resolves once the runner has written this check `running` (the write that counts a start). */
function markedRunning(checkId: string): Promise<void> {
	const { Check } = ctx.database.models;
	return new Promise((done) => {
		Check.addHook('afterBulkUpdate', 'marked-running', (options) => {
			// Sequelize hands a bulk update's values to its hooks as `attributes`.
			const { attributes, where } = options as { attributes?: { status?: string }; where?: object };
			if (attributes?.status !== 'running' || (where as { id?: string })?.id !== checkId) return;
			Check.removeHook('afterBulkUpdate', 'marked-running');
			done();
		});
	});
}

describe('the start-up sweep of checks cut off while running', () => {
	it(`queues one started ${MAX_CHECK_STARTS - 1} times again and fails one started ${MAX_CHECK_STARTS} times, with the reason`, async () => {
		const again = await leftBehind('running', MAX_CHECK_STARTS - 1);
		const spent = await leftBehind('running', MAX_CHECK_STARTS);
		const waiting = await leftBehind('queued', 0);
		const runner = new CheckRunner(ctx.database, worker.file, 1);
		const queued = await runner.resume();
		// A clean stop: whichever of them had started gives its start back.
		await runner.abort();
		expect([...queued].sort()).toEqual([again, waiting].sort());
		expect(await row(again)).toMatchObject({ status: 'queued', attempts: MAX_CHECK_STARTS - 1 });
		expect(await row(waiting)).toMatchObject({ status: 'queued', attempts: 0 });
		const failed = await row(spent);
		expect(failed).toMatchObject({ status: 'failed', attempts: MAX_CHECK_STARTS, result: null });
		expect(failed.error).toBe(cutOffReason(MAX_CHECK_STARTS));
		expect(failed.error).toMatch(
			new RegExp(`^Stopped: this check was cut off ${MAX_CHECK_STARTS} times while running`)
		);
		expect(failed.finishedAt).not.toBeNull();
		// What the check page and the API show.
		expect(await getCheck(ctx.database, asUser(ada), spent)).toMatchObject({
			status: 'failed',
			error: cutOffReason(MAX_CHECK_STARTS)
		});
		const { AuditEvent } = ctx.database.models;
		const event = await AuditEvent.findOne({ where: { subjectId: spent, action: 'check.failed' } });
		expect(event?.get('details')).toEqual({ error: cutOffReason(MAX_CHECK_STARTS) });
		// The failed check is not queued again at the following start.
		const next = new CheckRunner(ctx.database, worker.file, 1);
		expect(await next.resume()).not.toContain(spent);
		await next.abort();
		await ctx.database.models.Check.update({ status: 'cancelled' }, { where: { claimId } });
	});
});

describe('counting starts', () => {
	it('counts a start in the write that marks the check running; a clean stop gives it back', async () => {
		const id = await leftBehind('queued', 1);
		const runner = new CheckRunner(ctx.database, worker.file, 1);
		const running = markedRunning(id);
		expect(await runner.resume()).toEqual([id]);
		await running;
		expect(await row(id)).toMatchObject({ status: 'running', attempts: 2 });
		await runner.abort();
		expect(await row(id)).toMatchObject({ status: 'queued', attempts: 1, progress: 0 });
		await ctx.database.models.Check.update({ status: 'cancelled' }, { where: { id } });
	});
});
