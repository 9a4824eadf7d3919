/**
 * Writes under concurrency (issue 7 §3): 50 concurrent writes of each kind — role change,
 * invitation, upload, claim creation, check start — while four checks run, on a real SQLite file
 * with the real worker threads and the real mail catcher. Every one must succeed. SQLite allows
 * one writer at a time (sqlite.org/wal.html, "Concurrency"), so without connection-wide busy
 * timeouts, IMMEDIATE transactions and retries many of these answer SQLITE_BUSY.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeTransaction } from '../../src/lib/server/db/transactions';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { listChecks, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { changeMemberRole } from '../../src/lib/server/accounts/groups';
import { inviteMember } from '../../src/lib/server/accounts/invitations';
import type { UserActor } from '../../src/lib/server/core/actor';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { mailWorld, type MailWorld } from './mail-world';

const EACH = 50;
let world: MailWorld;
let workerFolder: string;
let groupId: string, lead: UserActor, claimId: string, slowClaimId: string;
const authors: string[] = [];
const csv = countsCsv(5, [0, 1], 50_000, 11);

beforeAll(async () => {
	world = await mailWorld();
	workerFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-worker-test-'));
	process.env.RANKSEAL_DATA_DIR = world.folder;
	process.env.RANKSEAL_CHECK_WORKERS = '2';
	// This test is about SQLite writers, not fair use: one person starts all 54 checks here.
	process.env.RANKSEAL_CHECKS_PER_USER = '100';
	process.env.RANKSEAL_CHECKS_PER_GROUP = '100';
	// Nor about the invitation limit, which inviteMember itself counts (30 an hour per lead).
	process.env.RANKSEAL_RATE_LIMITS = JSON.stringify({ invitations: { points: 100 } });
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(
		path.join(workerFolder, 'check-worker.mjs')
	);
	groupId = await addGroup(world.database, 'Fjord photonics');
	lead = asUser(await addUser(world.database, 'Lena Lead', [[groupId, 'lead']]));
	for (let i = 0; i < EACH; i++)
		authors.push(await addUser(world.database, `Author ${i}`, [[groupId, 'author']]));
	claimId = (await createClaim(world.database, lead, claimFields)).id;
	await addDataset(world.database, lead, claimId, { bytes: bytesOf(csv), originalName: 'a.csv' });
	slowClaimId = (await createClaim(world.database, lead, { ...claimFields, dimension: 7 })).id;
	const slow = countsCsv(7, [0, 1], 100_000, 5);
	await addDataset(world.database, lead, slowClaimId, {
		bytes: bytesOf(slow),
		originalName: 'slow.csv'
	});
});

afterAll(async () => {
	delete process.env.RANKSEAL_RATE_LIMITS;
	delete process.env.RANKSEAL_CHECKS_PER_USER;
	delete process.env.RANKSEAL_CHECKS_PER_GROUP;
	await stopCheckRunner(world.database);
	await world.close();
	rmSync(workerFolder, { recursive: true, force: true });
});

describe('writes under concurrency', () => {
	it('gives the connection of every transaction the busy timeout and foreign keys', async () => {
		// Sequelize's sqlite dialect opens a new connection per transaction (its connection manager).
		const settings = await writeTransaction(world.database, async (transaction) => {
			const read = async (pragma: string) =>
				world.database.sequelize.query(`PRAGMA ${pragma};`, {
					type: QueryTypes.SELECT,
					transaction
				});
			return [await read('busy_timeout'), await read('foreign_keys'), await read('journal_mode')];
		});
		expect(settings).toEqual([
			[{ timeout: 5000 }],
			[{ foreign_keys: 1 }],
			[{ journal_mode: 'wal' }]
		]);
	});

	it('lets 250 concurrent writes of five kinds all succeed while four checks run', async () => {
		const { database } = world;
		// Four long checks (10⁶ resamples) write their progress while the writes below run.
		for (let seed = 1; seed <= 4; seed++)
			await startCheck(database, lead, slowClaimId, { resamples: 1_000_000, seed });
		const writes: Promise<unknown>[] = [];
		for (let i = 0; i < EACH; i++) {
			writes.push(changeMemberRole(database, lead, groupId, authors[i], 'lead'));
			writes.push(
				inviteMember(database, lead, groupId, {
					email: `guest${i}@fjord.example`,
					role: 'author'
				})
			);
			// Distinct bytes (a comment differs), so that no upload repeats an earlier one.
			const bytes = bytesOf(`# upload ${i}\n${csv}`);
			writes.push(addDataset(database, lead, claimId, { bytes, originalName: `u${i}.csv` }));
			writes.push(createClaim(database, lead, { ...claimFields, title: `Claim ${i}` }));
			writes.push(startCheck(database, lead, claimId, { resamples: 100, seed: i + 1 }));
		}
		const outcomes = await Promise.allSettled(writes);
		const failures = outcomes.filter((o) => o.status === 'rejected');
		expect(failures.map((f) => String((f as PromiseRejectedResult).reason))).toEqual([]);

		const { Membership, Invitation, Dataset, Claim } = database.models;
		expect(await Membership.count({ where: { groupId, role: 'lead' } })).toBe(EACH + 1);
		expect(await Invitation.count({ where: { groupId } })).toBe(EACH);
		expect(await Dataset.count({ where: { claimId } })).toBe(EACH + 1);
		expect(await Claim.count({ where: { groupId } })).toBe(EACH + 2);
		// The runner's own writes (progress, results) held up too: every check ended done.
		await stopCheckRunner(database);
		const checks = [
			...(await listChecks(database, lead, claimId)),
			...(await listChecks(database, lead, slowClaimId))
		];
		expect(checks).toHaveLength(EACH + 4);
		expect(checks.filter((c) => c.status !== 'done').map((c) => c.error)).toEqual([]);
	});
});
