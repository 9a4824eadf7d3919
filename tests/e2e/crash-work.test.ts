/**
 * Killed while working (issue 10, faults): SIGKILL at seeded points while several checks run on
 * the worker threads, and while the outbox is delivered to the local mail catcher; then restart
 * on the same folder. Checks: a check cut short is queued again at the next start and finishes
 * with exactly the numbers of an uncut run with the same seed (the reproducibility contract,
 * DEVELOPERS.md), unless it was cut in every round: cut off MAX_CHECK_STARTS times, it is failed
 * with the reason (crash-loop.test.ts). Mail: a row marked sent was accepted by the
 * catcher; after the last restart every message arrives at least once, at most one duplicate per
 * kill (delivery is at-least-once, see DEVELOPERS.md). The folder is whole after every restart.
 */
import { rmSync, watch } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cutOffReason } from '../../src/lib/server/checks/left-behind';
import { writeTransaction } from '../../src/lib/server/db';
import { MAX_CHECK_STARTS } from '../../src/lib/server/checks/check-limits';
import { queueMail } from '../../src/lib/server/mail/mail-queue';
import { seedApiWorld, type ApiWorld } from './api-world';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { assertWhole, readRows, send, uniforms, whenChanged, withDatabase } from './fault-world';
import { startApp, type AppServer } from './server';

const ROUNDS = 3;
const SEED = 20261203;
/** Enough resamples that a check runs through many progress writes (d = 5, three bases). */
const RESAMPLES = 500_000;

let world: ApiWorld;
let claims: FinishedClaim[];
let app: AppServer | null = null;
const started: string[] = [];

// Checks cut in one round are still queued when the next round adds three: startApp's check
// limits are roomy unless a test names its own.
const start = () => startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });

/** Kills the server once `extra` more changes came in the data folder, or once `settled()`. */
async function killAfter(
	server: AppServer,
	extra: number,
	settled: () => Promise<boolean>
): Promise<void> {
	const watcher = watch(world.dataDir);
	const stopAsking = new AbortController();
	let seen = 0;
	await new Promise<void>((reached) => {
		watcher.on('change', () => ++seen >= extra && reached());
		void whenChanged(world.dataDir, settled, stopAsking.signal).then(() => reached());
	});
	watcher.close();
	stopAsking.abort();
	await server.kill();
}

beforeAll(async () => {
	world = await seedApiWorld();
	claims = await addFinishedClaims(world.dataDir, 3);
});
afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

async function startCheck(server: AppServer, claim: FinishedClaim, seed: number): Promise<void> {
	const body = JSON.stringify({ resamples: RESAMPLES, seed });
	const headers = {
		authorization: `Bearer ${world.tokens.lake}`,
		'content-type': 'application/json',
		'content-length': body.length
	};
	const url = `${server.origin}/api/v1/claims/${claim.claimId}/checks`;
	const answer = await send(url, 'POST', headers, body);
	expect(answer.status, answer.body).toBe(202);
	started.push(JSON.parse(answer.body).id);
}

const statusCount = async (status: string) =>
	(
		await readRows<{ n: number }>(
			world.dataDir,
			`SELECT COUNT(*) AS n FROM checks WHERE status = '${status}'`
		)
	)[0].n;
/** True once no check is queued or running. */
const allFinished = async () =>
	(await statusCount('queued')) + (await statusCount('running')) === 0;

describe('killed while checks run', () => {
	it('queues cut checks again; they finish with the numbers of an uncut run', async () => {
		const next = uniforms(SEED);
		for (let round = 0; round < ROUNDS; round++) {
			app = await start();
			if (round > 0) await assertWhole(world.dataDir);
			// The same three (claim, seed) pairs each round: their results must agree across rounds.
			for (const [i, claim] of claims.entries()) await startCheck(app, claim, 100 + i);
			// Then a seeded number of commits later (progress, results), or once all are done.
			await whenChanged(
				world.dataDir,
				async () => (await statusCount('running')) > 0 || (await allFinished())
			);
			await killAfter(app, Math.floor(next() * 60), allFinished);
			// No check fails for a kill before the last start (by then cut ≤ round < MAX_CHECK_STARTS
			// times); rows cut short still say queued or running.
			expect(await statusCount('failed')).toBe(0);
		}
		app = await start();
		await whenChanged(world.dataDir, allFinished);
		await app.stop();
		app = null;
		await assertWhole(world.dataDir);
		const rows = await readRows<{
			id: string;
			status: string;
			attempts: number;
			error: string | null;
			claim_id: string;
			result: string;
		}>(
			world.dataDir,
			`SELECT id, status, attempts, error, claim_id, result FROM checks WHERE id IN (${started.map((id) => `'${id}'`).join(',')})`
		);
		expect(rows).toHaveLength(ROUNDS * claims.length);
		// Done, or failed with the reason when cut off in MAX_CHECK_STARTS of the rounds (where the
		// kills land depends on the machine).
		const spent = {
			status: 'failed',
			attempts: MAX_CHECK_STARTS,
			error: cutOffReason(MAX_CHECK_STARTS)
		};
		const unfinished = rows.filter((r) => r.status !== 'done');
		expect(unfinished.map(({ status, attempts, error }) => ({ status, attempts, error }))).toEqual(
			unfinished.map(() => spent)
		);
		// The checks of the last round were cut at most once: each claim has a finished one.
		for (const [i, claim] of claims.entries()) {
			const results = rows
				.filter((r) => r.claim_id === claim.claimId && r.status === 'done')
				.map((r) => r.result);
			expect(results.length, `claim ${i}`).toBeGreaterThan(0);
			expect(new Set(results).size, `claim ${i}`).toBe(1);
		}
	}, 600_000);
});

const MAILS_PER_ROUND = 25;

/** Queues mail straight into the outbox (the server is stopped), as an event's transaction does. */
async function queueOutbox(round: number): Promise<void> {
	await withDatabase(world.dataDir, (database) =>
		writeTransaction(database, async (transaction) => {
			for (let i = 0; i < MAILS_PER_ROUND; i++) {
				const email = `reader${round}-${i}@example.test`;
				const values = { name: `Reader ${i}`, email, link: 'http://127.0.0.1/reset' };
				await queueMail(database, transaction, email, 'password-changed', values);
			}
		})
	);
}

/** How many catcher messages carry each outbox row's Message-ID (`<row id@host>`). */
async function arrivals(): Promise<{ id: string; status: string; copies: number }[]> {
	return readRows(
		world.dataDir,
		`SELECT o.id, o.status, (SELECT COUNT(*) FROM mail_messages m
		   WHERE instr(m.raw, '<' || o.id || '@') > 0) AS copies FROM outbox_mails o`
	);
}

const sentCount = async () =>
	(
		await readRows<{ n: number }>(
			world.dataDir,
			`SELECT COUNT(*) AS n FROM outbox_mails WHERE status = 'sent'`
		)
	)[0].n;

const delivered = async () =>
	(await readRows(world.dataDir, `SELECT id FROM outbox_mails WHERE status != 'sent'`)).length ===
	0;

describe('killed while delivering mail', () => {
	it('loses no message: each is sent (and caught) or still pending', async () => {
		const next = uniforms(SEED + 1);
		for (let round = 0; round < ROUNDS; round++) {
			await queueOutbox(round);
			app = await start();
			// Once a seeded number of this round's messages went out, a seeded few changes later.
			const target = round * MAILS_PER_ROUND + Math.floor(next() * MAILS_PER_ROUND);
			await whenChanged(world.dataDir, async () => (await sentCount()) >= target);
			await killAfter(app, Math.floor(next() * 8), delivered);
			app = null;
			// A row is marked sent only after the catcher stored it.
			const rows = await arrivals();
			expect(rows.filter((r) => r.status === 'sent' && r.copies === 0)).toEqual([]);
			expect(rows.filter((r) => r.status === 'failed')).toEqual([]);
		}
		app = await start();
		await whenChanged(world.dataDir, delivered);
		await app.stop();
		app = null;
		const rows = await arrivals();
		expect(rows).toHaveLength(ROUNDS * MAILS_PER_ROUND);
		expect(rows.filter((r) => r.copies === 0)).toEqual([]);
		// One message can be in flight at a kill: at most one duplicate per kill.
		const duplicates = rows.reduce((sum, r) => sum + r.copies - 1, 0);
		expect(duplicates).toBeLessThanOrEqual(ROUNDS);
		await assertWhole(world.dataDir);
	}, 600_000);
});
