/**
 * Fair use of the workers, against a real SQLite file and real worker threads. The checks here
 * never finish by themselves: the worker under test reports "started" and then waits until it
 * is aborted, so every start is caused by a cancel the test makes, never by a time.
 */
import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import type { CheckRunner } from '../../src/lib/server/checks/runner';
import { cancelCheck, getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import {
	ConflictError,
	ForbiddenError,
	NotFoundError,
	RateLimitedError
} from '../../src/lib/server/core/errors';
import { groupStorage } from '../../src/lib/server/accounts/group-storage';
import { newId } from '../../src/lib/server/core/ids';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { asReferee, asUser } from './actors';
import { temporaryDatabase } from './db';
import { waitingWorker, type WaitingWorker } from '../waiting-worker';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let worker: WaitingWorker;
let lake: string, ada: string, ben: string, cyd: string, lakeClaim: string, ridgeClaim: string;
const saved = { ...process.env };

/** Runs `body` with these settings in the environment (config() reads it on every call). */
async function withEnv(values: Record<string, string>, body: () => Promise<void>) {
	Object.assign(process.env, values);
	try {
		await body();
	} finally {
		for (const key of Object.keys(values)) process.env[key] = saved[key];
	}
}

const runner = async () => (await startCheckRunner(ctx.database)) as CheckRunner;

/** Cancels the check and waits until the runner has handed its thread to the next one. */
async function cancelAndSettle(userId: string, checkId: string) {
	await cancelCheck(ctx.database, asUser(userId), checkId);
	await (await runner()).settled(checkId);
}

async function cancelEverything() {
	const { Check } = ctx.database.models;
	const rows = await Check.findAll({ where: { status: ['queued', 'running'] } });
	for (const id of rows.map((row) => row.get('id') as string)) {
		await Check.update({ status: 'cancelled' }, { where: { id } });
		(await runner()).cancel(id);
		await (await runner()).settled(id);
	}
}

beforeAll(async () => {
	ctx = await temporaryDatabase();
	// Uploads still read through the real engine; checks wait for their abort.
	worker = await waitingWorker();
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.RANKSEAL_CHECK_WORKERS = '1';
	process.env.RANKSEAL_CHECK_WORKER = worker.file;
	lake = await addGroup(ctx.database, 'Lake optics');
	const ridge = await addGroup(ctx.database, 'Ridge qudits');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'lead']]);
	ben = await addUser(ctx.database, 'Ben Holm', [[lake, 'author']]);
	cyd = await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]);
	lakeClaim = (await createClaim(ctx.database, asUser(ada), claimFields)).id;
	ridgeClaim = (await createClaim(ctx.database, asUser(cyd), claimFields)).id;
	const upload = (claimId: string, user: string, seed: number) =>
		addDataset(ctx.database, asUser(user), claimId, {
			bytes: bytesOf(countsCsv(5, [0, 1], 50_000, seed)),
			originalName: `run-${seed}.csv`
		});
	await upload(lakeClaim, ada, 1);
	await upload(ridgeClaim, cyd, 2);
});

afterAll(async () => {
	await cancelEverything();
	await stopCheckRunner(ctx.database);
	await ctx.close();
	worker?.remove();
	process.env = saved;
});

describe('fair scheduling between groups', () => {
	it('with one worker thread, group B’s one check starts second although group A queued five first', async () => {
		await withEnv({ RANKSEAL_CHECKS_PER_USER: '10', RANKSEAL_CHECKS_PER_GROUP: '10' }, async () => {
			const from = (await runner()).started.length;
			const a: string[] = [];
			for (let seed = 1; seed <= 5; seed++)
				a.push((await startCheck(ctx.database, asUser(ada), lakeClaim, { seed })).id);
			const b = (await startCheck(ctx.database, asUser(cyd), ridgeClaim)).id;
			const started = () => runner().then((r) => r.started.slice(from));
			expect(await started()).toEqual([a[0]]);
			await cancelAndSettle(ada, a[0]);
			expect(await started()).toEqual([a[0], b]);
			// A queued check that is cancelled never starts; group A goes on oldest first.
			await cancelCheck(ctx.database, asUser(ada), a[1]);
			await cancelAndSettle(cyd, b);
			expect(await started()).toEqual([a[0], b, a[2]]);
			await cancelAndSettle(ada, a[2]);
			await cancelAndSettle(ada, a[3]);
			await cancelAndSettle(ada, a[4]);
			expect(await started()).toEqual([a[0], b, a[2], a[3], a[4]]);
			const first = await getCheck(ctx.database, asUser(ada), a[0]);
			expect(first).toMatchObject({ status: 'cancelled', cancelledBy: 'Ada Lind', result: null });
			expect(first.cancelledAt).not.toBeNull();
		});
	});
});

describe('limits on queued and running checks', () => {
	it('refuses a person’s, a group’s and a review link’s check over the limit with 429 words and a wait, then lets one in after a cancel', async () => {
		const env = {
			RANKSEAL_CHECKS_PER_USER: '2',
			RANKSEAL_CHECKS_PER_GROUP: '3',
			RANKSEAL_CHECK_RETRY_AFTER_S: '45'
		};
		await withEnv(env, async () => {
			const start = (user: string, claimId = lakeClaim) =>
				startCheck(ctx.database, asUser(user), claimId);
			const first = await start(ada);
			await start(ada);
			const personal = await start(ada).catch((e) => e);
			expect(personal).toBeInstanceOf(RateLimitedError);
			expect(personal.message).toMatch(/the limit is 2 per person/);
			expect(personal.retryAfterSeconds).toBe(45);
			await start(ben);
			const group = await start(ben).catch((e) => e);
			expect(group).toBeInstanceOf(RateLimitedError);
			expect(group.message).toMatch(/This group has 3 checks queued or running; the limit is 3/);
			// Another group is not held up; a referee's re-run counts in its link's bucket.
			await start(cyd, ridgeClaim);
			const rerun = await startCheck(ctx.database, asReferee(lakeClaim), lakeClaim);
			expect((await ctx.database.models.Check.findByPk(rerun.id))!.get('reviewLinkId')).toBe(
				'review-link-under-test'
			);
			// One re-run per link at a time: the same 429 words and wait as the other limits.
			const referee = asReferee(lakeClaim);
			const twice = await startCheck(ctx.database, referee, lakeClaim).catch((e) => e);
			expect(twice).toBeInstanceOf(RateLimitedError);
			expect(twice.message).toMatch(
				/^A re-run from this review link is still queued or running; the limit is 1 at a time per link\. Wait for it to finish or cancel it\.$/
			);
			expect(twice.retryAfterSeconds).toBe(45);
			await cancelCheck(ctx.database, referee, rerun.id);
			await (await runner()).settled(rerun.id);
			await expect(startCheck(ctx.database, referee, lakeClaim)).resolves.toMatchObject({
				status: 'queued'
			});
			await cancelAndSettle(ada, first.id);
			await expect(start(ada)).resolves.toMatchObject({ status: 'queued' });
			expect(await ctx.database.models.Check.count({ where: { createdBy: ada } })).toBeGreaterThan(
				0
			);
			await cancelEverything();
		});
	});
});

describe('cancelling', () => {
	it('answers 409 for a second cancel and for a finished check, 404 outside the group, 403 for a member on a referee’s re-run', async () => {
		const check = await startCheck(ctx.database, asUser(ben), lakeClaim);
		await expect(cancelCheck(ctx.database, asUser(cyd), check.id)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await cancelAndSettle(ben, check.id);
		const again = await cancelCheck(ctx.database, asUser(ada), check.id).catch((e) => e);
		expect(again).toBeInstanceOf(ConflictError);
		expect(again.message).toMatch(/cancelled already/);
		const done = newId();
		const { Check, AuditEvent } = ctx.database.models;
		await Check.create({
			...{ id: done, claimId: lakeClaim, datasetId: check.datasetId, createdBy: ada },
			...{ status: 'done', progress: 1, resamples: 1000, confidence: 0.99865, seed: 1 }
		});
		await expect(cancelCheck(ctx.database, asUser(ada), done)).rejects.toThrow(/done already/);
		expect(
			await AuditEvent.count({ where: { subjectId: check.id, action: 'check.cancelled' } })
		).toBe(1);
		const rerun = await startCheck(ctx.database, asReferee(lakeClaim), lakeClaim);
		await expect(cancelCheck(ctx.database, asUser(ada), rerun.id)).rejects.toBeInstanceOf(
			ForbiddenError
		);
		await cancelCheck(ctx.database, asReferee(lakeClaim), rerun.id);
		await (await runner()).settled(rerun.id);
		expect(await getCheck(ctx.database, asUser(ada), rerun.id)).toMatchObject({
			status: 'cancelled',
			cancelledBy: 'the referee'
		});
	});
});

describe('resamples ceiling', () => {
	it('refuses resamples over cells × resamples ≤ 2·10⁹ for the claim, naming the field and the ceiling', async () => {
		// d = 64, two bases: 8 192 cells, so at most ⌊2·10⁹ / 8 192⌋ = 244 140 resamples. Since
		// engine 3.0.0 the ceiling binds only per-cell draws (subtracted accidentals, rates).
		const big = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 64,
			method: 'fidelity-two-basis',
			claimedSchmidtNumber: 2
		});
		const refused = await startCheck(ctx.database, asUser(ada), big.id, {
			resamples: 244_141,
			subtractAccidentals: true
		}).catch((e) => e);
		expect(refused.issues[0].path).toEqual(['resamples']);
		expect(refused.message).toMatch(/at most 244,140 for d = 64 on 2 bases/);
		expect(await ctx.database.models.Check.count({ where: { claimId: big.id } })).toBe(0);
	});
});

describe('storage quota', () => {
	it('refuses an upload over the group’s quota, storing nothing, and shows the usage to the lead only', async () => {
		const lead = asUser(ada);
		const before = await groupStorage(ctx.database, lead, lake);
		const bytes = bytesOf(countsCsv(5, [0, 1], 50_000, 99));
		const sha = sha256Hex(bytes);
		const quota = String(before.usedBytes + bytes.byteLength - 1);
		await withEnv({ RANKSEAL_GROUP_QUOTA_BYTES: quota }, async () => {
			const refused = await addDataset(ctx.database, lead, lakeClaim, {
				bytes,
				originalName: 'big.csv'
			}).catch((e) => e);
			expect(refused).toBeInstanceOf(ConflictError);
			expect(refused.message).toMatch(/over its storage quota of/);
			expect(await ctx.database.models.Dataset.count({ where: { sha256: sha } })).toBe(0);
			expect(existsSync(datasetFilePath(sha))).toBe(false);
			expect(await groupStorage(ctx.database, lead, lake)).toEqual({
				usedBytes: before.usedBytes,
				quotaBytes: Number(quota)
			});
		});
		await expect(groupStorage(ctx.database, asUser(ben), lake)).rejects.toBeInstanceOf(
			ForbiddenError
		);
	});
});
