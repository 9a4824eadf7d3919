/** The check runner end to end: real worker threads (piscina) running the bundled engine. */
import { rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { certify, parseCounts } from '../../src/lib/certify';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import {
	getCheck,
	listChecks,
	startCheck,
	type CheckView
} from '../../src/lib/server/checks/checks';
import { createClaim, getClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import { ConflictError, NotFoundError } from '../../src/lib/server/core/errors';
import { newId } from '../../src/lib/server/core/ids';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { asUser } from './actors';
import { workerDatabase, type WorkerDatabase } from './worker-database';

let ctx: WorkerDatabase;
let ada: string, cyd: string, claimId: string, datasetId: string;
/** Unequal integration times make the engine resample every cell: slow enough to watch. */
const slowCsv = countsCsv(7, [0, 1], 100_000, 5)
	.replace('counts\n', 'counts,duration_s\n')
	.replace(
		/^(\d+),(\d+),(\d+),(\d+)$/gm,
		(row, t, a, b) => `${row},${t === '0' && a === '0' && b === '0' ? 2 : 1}`
	);

/** Every status and progress the runner wrote to each check row, in order (a Sequelize hook). */
const written = new Map<string, { status: string; progress: number }[]>();

/** The check once the runner is idle (awaited, not polled), and every state it was written in. */
async function follow(userId: string, id: string) {
	await (await startCheckRunner(ctx.database)).idle();
	const check = (await getCheck(ctx.database, asUser(userId), id))!;
	return { check, seen: written.get(id) ?? [] };
}

/** Records the runner's writes as they happen; it observes, it changes nothing. */
function observeCheckWrites() {
	ctx.database.models.Check.addHook('afterBulkUpdate', (options) => {
		const where = options.where as { id?: unknown };
		const values = (options as { attributes?: { status?: string; progress?: number } }).attributes;
		if (typeof where?.id !== 'string' || !values) return;
		const list = written.get(where.id) ?? [];
		const last = list.at(-1) ?? { status: 'queued', progress: 0 };
		list.push({ status: values.status ?? last.status, progress: values.progress ?? last.progress });
		written.set(where.id, list);
	});
}

beforeAll(async () => {
	ctx = await workerDatabase(2);
	observeCheckWrites();
	const lake = await addGroup(ctx.database, 'Lake optics');
	const ridge = await addGroup(ctx.database, 'Ridge qudits');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
	cyd = await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]);
	claimId = (
		await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 7,
			claimedSchmidtNumber: 4
		})
	).id;
	datasetId = (
		await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(slowCsv),
			originalName: 'slow.csv'
		})
	).id;
});
afterAll(async () => {
	await ctx.close();
});

describe('check runner', () => {
	it('runs a check queued → running → done, progress reaching 1, with the engine’s exact result', async () => {
		const queued = await startCheck(ctx.database, asUser(ada), claimId, {
			resamples: 100_000,
			seed: 42
		});
		expect(queued).toMatchObject({
			status: 'queued',
			progress: 0,
			datasetId,
			resamples: 100_000,
			seed: 42,
			result: null
		});
		const { check, seen } = await follow(ada, queued.id);
		expect(check.status).toBe('done');
		expect(check.progress).toBe(1);
		expect(check.startedAt && check.finishedAt && check.startedAt <= check.finishedAt).toBe(true);
		expect(seen.some((s) => s.status === 'running' && s.progress > 0 && s.progress < 1)).toBe(true);
		const progress = seen.map((s) => s.progress);
		expect(progress).toEqual([...progress].sort((a, b) => a - b));

		const dataset = await ctx.database.models.Dataset.findByPk(datasetId);
		const sha256 = dataset!.get('sha256') as string;
		const direct = certify(parseCounts(bytesOf(slowCsv), 7), {
			method: 'mub-correlation',
			bases: [0, 1],
			resamples: 100_000,
			confidence: check.confidence,
			seed: 42,
			claim: 4,
			inputSha256: sha256
		});
		expect(check.result).toEqual(JSON.parse(JSON.stringify(direct)));
		expect(check.result!.inputSha256).toBe(sha256);
		expect((await getClaim(ctx.database, asUser(ada), claimId))?.state).toBe('checked');
		expect((await getClaim(ctx.database, asUser(ada), claimId))?.latestCheck).toEqual({
			id: check.id,
			status: 'done',
			certifiedSchmidtNumber: direct.certifiedSchmidtNumber,
			verdict: direct.claim!.verdict
		});
	});

	it('runs two checks at once, each with exactly its own seed’s result', async () => {
		// Whether they overlap in time, and how long the event loop waits, depend on the machine:
		// neither is asserted. What must hold whatever the speed: each result is its own seed's.
		const [a, b] = await Promise.all([
			startCheck(ctx.database, asUser(ada), claimId, { resamples: 20_000, seed: 1 }),
			startCheck(ctx.database, asUser(ada), claimId, { resamples: 20_000, seed: 2 })
		]);
		const [ra, rb] = await Promise.all([follow(ada, a.id), follow(ada, b.id)]);
		expect([ra.check.status, rb.check.status]).toEqual(['done', 'done']);
		const sha256 = ra.check.result!.inputSha256 ?? undefined;
		for (const [run, seed] of [
			[ra, 1],
			[rb, 2]
		] as const) {
			const direct = certify(parseCounts(bytesOf(slowCsv), 7), {
				method: 'mub-correlation',
				bases: [0, 1],
				resamples: 20_000,
				confidence: run.check.confidence,
				seed,
				claim: 4,
				inputSha256: sha256
			});
			expect(run.check.result).toEqual(JSON.parse(JSON.stringify(direct)));
		}
		expect(ra.check.result!.statistic.lower).not.toBe(rb.check.result!.statistic.lower);
	});

	it('records a failure in words when the stored file has gone', async () => {
		const other = countsCsv(7, [0, 1], 20_000, 77);
		const dataset = await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(other),
			originalName: 'gone.csv'
		});
		rmSync(datasetFilePath(dataset.sha256));
		const queued = await startCheck(ctx.database, asUser(ada), claimId, {
			datasetId: dataset.id,
			resamples: 1000
		});
		const { check } = await follow(ada, queued.id);
		expect(check.status).toBe('failed');
		expect(check.error).toBe('the stored counts file cannot be read');
		expect(check.result).toBeNull();
	});

	it('re-queues checks that an earlier process left running', async () => {
		await stopCheckRunner(ctx.database);
		const id = newId();
		await ctx.database.models.Check.create({
			id,
			claimId,
			datasetId,
			createdBy: ada,
			status: 'running',
			progress: 0.4,
			resamples: 2000, // rates: at least ⌈2/α⌉ = 1 482 (engine 3.0.0)
			confidence: 0.99865,
			seed: 3,
			startedAt: new Date()
		});
		const runner = await startCheckRunner(ctx.database);
		await runner.idle();
		const check = (await getCheck(ctx.database, asUser(ada), id)) as CheckView;
		expect(check).toMatchObject({ status: 'done', progress: 1 });
		expect(check.result!.seed).toBe(3);
	});

	it('fails the check, rather than waiting forever, when the worker cannot start', async () => {
		await stopCheckRunner(ctx.database);
		const good = process.env.RANKSEAL_CHECK_WORKER;
		const broken = path.join(ctx.workerFolder, 'broken.mjs');
		writeFileSync(broken, "throw new Error('no engine here');\nexport default () => null;\n");
		process.env.RANKSEAL_CHECK_WORKER = broken;
		try {
			const queued = await startCheck(ctx.database, asUser(ada), claimId, { resamples: 1000 });
			const { check } = await follow(ada, queued.id);
			expect(check).toMatchObject({
				status: 'failed',
				error: 'the check worker stopped: no engine here'
			});
		} finally {
			await stopCheckRunner(ctx.database);
			process.env.RANKSEAL_CHECK_WORKER = good;
		}
	});

	it('checks settings and hides checks of another group', async () => {
		await expect(startCheck(ctx.database, asUser(ada), claimId, { resamples: 5 })).rejects.toThrow(
			/Resamples must be at least 100/
		);
		await expect(
			startCheck(ctx.database, asUser(ada), claimId, { datasetId: 'nope' })
		).rejects.toBeInstanceOf(NotFoundError);
		await expect(startCheck(ctx.database, asUser(cyd), claimId)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await expect(listChecks(ctx.database, asUser(cyd), claimId)).rejects.toBeInstanceOf(
			NotFoundError
		);
		const [newest] = await listChecks(ctx.database, asUser(ada), claimId);
		await expect(getCheck(ctx.database, asUser(cyd), newest.id)).rejects.toBeInstanceOf(
			NotFoundError
		);
	});

	it('answers a conflict, not bad input, for a claim without counts', async () => {
		const bare = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			title: 'No counts'
		});
		const attempt = startCheck(ctx.database, asUser(ada), bare.id);
		await expect(attempt).rejects.toBeInstanceOf(ConflictError);
		await expect(attempt).rejects.toThrow(/no counts file yet/);
	});
});
