/**
 * Issue 16 part 2: counts uploads in progress at once are limited per person and per group (429
 * with Retry-After), and a refused upload is refused before its body is read. Uploads are held
 * on the work pool (their reading waits for the test's `go`, tests/waiting-worker.ts), so what
 * is in progress is a state the test sets, not a race.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Actor } from '../../src/lib/server/core/actor';
import { asUser } from './actors';
import { addGroup, addUser, claimFields, countsCsv } from './backend-fixtures';
import { pacedTasks, waitingWorker } from '../waiting-worker';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-upload-limits-'));
const CHANNEL = `rankseal-upload-limits-${process.pid}`;
const worker = await waitingWorker({ held: { channel: CHANNEL, tasks: ['summariseCounts'] } });
Object.assign(process.env, {
	RANKSEAL_DATA_DIR: path.join(folder, 'data'),
	MAIL_CATCHER_PORT: '0',
	RANKSEAL_CHECK_WORKER: worker.file,
	RANKSEAL_CHECK_WORKERS: '2',
	RANKSEAL_SHORT_TASK_WORKERS: '2',
	RANKSEAL_UPLOADS_PER_USER: '1',
	RANKSEAL_UPLOADS_PER_GROUP: '2',
	RANKSEAL_UPLOAD_RETRY_AFTER_S: '10'
});

const { app, stopApp } = await import('../../src/lib/server/app/app');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const datasetsApi = await import('../../src/routes/api/v1/claims/[id]/datasets/+server');

const paced = pacedTasks(CHANNEL);
let ada: Actor, bo: Actor, cyd: Actor, dee: Actor;
let lakeClaim: string, ridgeClaim: string;

beforeAll(async () => {
	const { database } = await app();
	const lake = await addGroup(database, 'Lake optics');
	const ridge = await addGroup(database, 'Ridge qudits');
	ada = asUser(await addUser(database, 'Ada Lind', [[lake, 'lead']]));
	bo = asUser(await addUser(database, 'Bo Strand', [[lake, 'author']]));
	cyd = asUser(await addUser(database, 'Cyd Marsh', [[lake, 'author']]));
	dee = asUser(await addUser(database, 'Dee Fjord', [[ridge, 'lead']]));
	lakeClaim = (await createClaim(database, ada, claimFields)).id;
	ridgeClaim = (await createClaim(database, dee, claimFields)).id;
});

afterAll(async () => {
	paced.release();
	paced.close();
	await stopApp();
	rmSync(folder, { recursive: true, force: true });
	worker.remove();
});

/** A CSV upload through the API, as Kit hands it to the endpoint; seeds make the bytes differ. */
function upload(actor: Actor, claimId: string, seed: number): Promise<Response> {
	const url = `http://localhost/api/v1/claims/${claimId}/datasets`;
	const request = new Request(url, {
		method: 'POST',
		body: countsCsv(5, [0, 1], 50_000, seed),
		headers: { 'content-type': 'text/csv' }
	});
	const locals = { actor, user: null, session: null };
	const event = { locals, url: new URL(url), params: { id: claimId }, request };
	return datasetsApi.POST(event as never) as Promise<Response>;
}

/** The answer, or 'held' when the upload reached a worker first (it would have been let in). */
const answerOrHeld = (answer: Promise<Response>, heldCount: number) =>
	Promise.race([answer, paced.whenStarted(heldCount).then(() => 'held' as const)]);

describe('uploads in progress at once', () => {
	it('refuses a second per person and a third per group with 429 and Retry-After; another group goes ahead', async () => {
		const first = upload(ada, lakeClaim, 1);
		await paced.whenStarted(1);
		const second = await answerOrHeld(upload(ada, lakeClaim, 2), 2);
		expect(second, 'the second upload of one person was let in').not.toBe('held');
		const refused = second as Response;
		expect(refused.status).toBe(429);
		expect(refused.headers.get('retry-after')).toBe('10');
		expect((await refused.json()).error).toMatchObject({
			code: 'rate_limited',
			message:
				'You have 1 uploads in progress; the limit is 1 at once per person. Wait for one to finish.'
		});

		const bos = upload(bo, lakeClaim, 3);
		await paced.whenStarted(2);
		const cyds = await answerOrHeld(upload(cyd, lakeClaim, 4), 3);
		expect(cyds, 'a third upload of one group was let in').not.toBe('held');
		expect((cyds as Response).status).toBe(429);
		expect((await (cyds as Response).json()).error.message).toMatch(
			/^This group has 2 uploads in progress; the limit is 2 at once per group\./
		);

		// Another group's member is not held up by this group.
		const dees = upload(dee, ridgeClaim, 5);
		await paced.whenStarted(3);
		paced.release();
		for (const answer of await Promise.all([first, bos, dees])) expect(answer.status).toBe(201);

		// The slots are given back: the same person uploads again.
		expect((await upload(ada, lakeClaim, 6)).status).toBe(201);
	});

	it('gives the slot back when the upload is refused as a bad file', async () => {
		const url = `http://localhost/api/v1/claims/${lakeClaim}/datasets`;
		const bad = () =>
			datasetsApi.POST({
				locals: { actor: ada, user: null, session: null },
				url: new URL(url),
				params: { id: lakeClaim },
				request: new Request(url, {
					method: 'POST',
					body: 'basis,outcome_a,outcome_b,counts\n0,0,9,1\n',
					headers: { 'content-type': 'text/csv' }
				})
			} as never) as Promise<Response>;
		for (let i = 0; i < 2; i++) {
			const answer = await bad();
			expect(answer.status).toBe(400);
			expect((await answer.json()).error).toMatchObject({ code: 'bad_counts', line: 2 });
		}
	});
});
