/**
 * A check that brings the server down every time it runs (issue 10: "running checks are re-queued
 * or marked failed with the reason"): the built app is SIGKILLed each time the check is running,
 * and restarted on the same folder. The check is queued again until it has been cut off
 * MAX_CHECK_STARTS times; the next start fails it with the reason, shown by the API and the check
 * page, and the app stays up. A clean stop (SIGTERM) gives its start back, so stops never fail a
 * check. The worker reports "started" and then waits to be aborted: each kill or stop is paced by
 * the check's own row, never by a time.
 */
import { rmSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cutOffReason } from '../../src/lib/server/checks/left-behind';
import { MAX_CHECK_STARTS } from '../../src/lib/server/checks/check-limits';
import { seedApiWorld, type ApiWorld } from './api-world';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { apiPost, assertWhole, readRows, send, whenChanged } from './fault-world';
import { startApp, type AppServer } from './server';
import { waitingWorker, type WaitingWorker } from '../waiting-worker';

let world: ApiWorld;
let claims: FinishedClaim[];
let worker: WaitingWorker | undefined;
let app: AppServer | null = null;

beforeAll(async () => {
	world = await seedApiWorld();
	claims = await addFinishedClaims(world.dataDir, 2);
	worker = await waitingWorker();
});
afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
	worker?.remove();
});

const start = () =>
	startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_DEMO: '0',
		RANKSEAL_CHECK_WORKER: worker!.file
	});

async function checkRow(id: string) {
	const [row] = await readRows<{ status: string; attempts: number; error: string | null }>(
		world.dataDir,
		`SELECT status, attempts, error FROM checks WHERE id = '${id}'`
	);
	return row;
}

/** Starts a check of the claim through the API; its id. */
async function startCheck(server: AppServer, claimId: string): Promise<string> {
	const body = JSON.stringify({ resamples: 1000, seed: 9 });
	const answer = await apiPost(server.origin, world.tokens.lake, `/claims/${claimId}/checks`, body);
	expect(answer.status, answer.body).toBe(202);
	return JSON.parse(answer.body).id as string;
}

/** Resolves once the check is running (the write that marks it so also counts the start). */
const untilRunning = (id: string) =>
	whenChanged(world.dataDir, async () => (await checkRow(id)).status === 'running');

describe('a check that is cut off every time it runs', () => {
	it(`is failed with the reason at the start after it was cut off ${MAX_CHECK_STARTS} times`, async () => {
		const claimId = claims[0].claimId;
		app = await start();
		const id = await startCheck(app, claimId);
		for (let cut = 1; cut <= MAX_CHECK_STARTS; cut++) {
			// Killed while running its cut-th start (each restart queued it again and started it).
			await untilRunning(id);
			expect(await checkRow(id)).toMatchObject({ status: 'running', attempts: cut });
			await app.kill();
			app = await start();
		}
		const failed = { status: 'failed', error: cutOffReason(MAX_CHECK_STARTS) };
		expect(await checkRow(id)).toEqual({ ...failed, attempts: MAX_CHECK_STARTS });
		const headers = { authorization: `Bearer ${world.tokens.lake}` };
		const read = await send(`${app.origin}/api/v1/checks/${id}`, 'GET', headers);
		expect(read.status, read.body).toBe(200);
		expect(JSON.parse(read.body)).toMatchObject(failed);
		const cookie = { cookie: `rankseal_session=${world.session}` };
		const page = await send(`${app.origin}/claims/${claimId}/checks/${id}`, 'GET', cookie);
		expect(page.status).toBe(200);
		expect(page.body).toContain(`cut off ${MAX_CHECK_STARTS} times while running`);
		expect(app.output()).toContain(`check ${id} failed: cut off ${MAX_CHECK_STARTS} times`);
		await app.stop();
		app = null;
		await assertWhole(world.dataDir);
	}, 300_000);
});

describe('a check stopped by clean shutdowns', () => {
	it(`is queued again after ${MAX_CHECK_STARTS + 1} SIGTERMs, none of them counted as a cut`, async () => {
		app = await start();
		const id = await startCheck(app, claims[1].claimId);
		for (let stop = 1; stop <= MAX_CHECK_STARTS + 1; stop++) {
			await untilRunning(id);
			expect(await checkRow(id)).toMatchObject({ status: 'running', attempts: 1 });
			const exited = new Promise((done) => app!.child.once('exit', done));
			app.child.kill('SIGTERM');
			expect(await exited, app.output()).toBe(0);
			// The stop gave the start back.
			expect(await checkRow(id)).toEqual({ status: 'queued', attempts: 0, error: null });
			app = await start();
		}
		await untilRunning(id);
		await app.stop();
		app = null;
	}, 300_000);
});
