/**
 * Issue 16 part 1: a /seal bundle check runs on the work pool, never on the request thread, and
 * the public /seal upload and look-ups are rate-limited per client address. The pool is paced,
 * not timed: the checks wait on their threads until cancelled and each bundle check waits for the
 * test's `go` (tests/waiting-worker.ts), so the order below is the only thing asserted.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isHttpError } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { UserActor } from '../../src/lib/server/core/actor';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { finishedCheck, type EvidenceWorld } from './evidence-world';
import { pacedTasks, waitingWorker } from '../waiting-worker';

// Safety limits for bundling the worker and issuing on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-seal-pool-'));
const CHANNEL = `rankseal-seal-pool-${process.pid}`;
const worker = await waitingWorker({ held: { channel: CHANNEL, tasks: ['verifyBundle'] } });
Object.assign(process.env, {
	RANKSEAL_DATA_DIR: path.join(folder, 'data'),
	ORIGIN: 'https://rankseal.test',
	MAIL_CATCHER_PORT: '0',
	RANKSEAL_CHECK_WORKER: worker.file,
	RANKSEAL_CHECK_WORKERS: '2',
	RANKSEAL_SHORT_TASK_WORKERS: '1',
	RANKSEAL_RATE_LIMITS: JSON.stringify({ sealBundle: { points: 6 }, sealLookup: { points: 2 } })
});

const { app, stopApp } = await import('../../src/lib/server/app/app');
const { resetRateLimits } = await import('../../src/lib/server/core/rate-limits');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const { addDataset } = await import('../../src/lib/server/datasets/datasets');
const { startCheck } = await import('../../src/lib/server/checks/checks');
const { issueCertificate } = await import('../../src/lib/server/certificates/certificates');
const { certificateFile } = await import('../../src/lib/server/certificates/certificate-reads');
const sealPage = await import('../../src/routes/seal/+page.server');
const sealIdPage = await import('../../src/routes/seal/[id]/+page.server');
const signingKeys = await import('../../src/routes/api/v1/signing-keys/+server');

let author: UserActor;
let claimId: string;
let bundle: Uint8Array;
let certificateId: string;
/** Bundle checks wait on their thread until released (the first test); later ones run at once. */
const paced = pacedTasks(CHANNEL);

beforeAll(async () => {
	resetRateLimits();
	const { database } = await app();
	const lake = await addGroup(database, 'Lake optics');
	author = asUser(await addUser(database, 'Bo Strand', [[lake, 'lead']]));
	claimId = (await createClaim(database, author, claimFields)).id;
	const dataset = await addDataset(database, author, claimId, {
		bytes: bytesOf(countsCsv(5, [0, 1, 2], 40_000, 11)),
		originalName: 'run3.csv'
	});
	const world = { database, author, claimId, datasetId: dataset.id } as unknown as EvidenceWorld;
	const check = await finishedCheck(world, 23);
	certificateId = (await issueCertificate(database, author, claimId, check.id)).id;
	bundle = (await certificateFile(database, author, certificateId, 'bundle')).bytes;
});

afterAll(async () => {
	paced.release();
	paced.close();
	await stopApp();
	rmSync(folder, { recursive: true, force: true });
	worker.remove();
});

/** What Kit hands the /seal pages: a client address, headers to set, a request. */
function sealEvent(address: string, request: Request, url = new URL('http://localhost/seal')) {
	const headers: Record<string, string> = {};
	const event = {
		request,
		url,
		params: {},
		locals: {},
		getClientAddress: () => address,
		setHeaders: (more: Record<string, string>) => Object.assign(headers, more)
	};
	return { event: event as never, headers };
}

function bundleUpload(address: string) {
	const form = new FormData();
	form.set('bundle', new Blob([Buffer.from(bundle)]), 'bundle.zip');
	const request = new Request('http://localhost/seal?/bundle', { method: 'POST', body: form });
	return sealEvent(address, request);
}

type Checked = { checked: { report: { valid: boolean }; record: { status: string } } };

describe('bundle checks on the work pool', () => {
	it('answers a bystander while six bundle checks are in flight and both check threads are held', async () => {
		const { database } = await app();
		// Three long checks: two hold both check threads (they wait until cancelled), one queues.
		for (const seed of [1, 2, 3]) await startCheck(database, author, claimId, { seed });
		const finished: number[] = [];
		const seals = Array.from({ length: 6 }, (_, i) =>
			Promise.resolve(sealPage.actions.bundle(bundleUpload(`203.0.113.${i + 1}`).event)).then(
				(answer) => {
					finished.push(i);
					return answer as unknown as Checked;
				}
			)
		);
		// Whichever comes first: a bundle check held on the thread kept for short tasks, or an answer.
		const first = await Promise.race([
			paced.whenStarted(1).then(() => 'held on a worker'),
			Promise.race(seals).then(() => 'a bundle check answered')
		]);
		expect(first, 'a bundle check finished before the bystander asked').toBe('held on a worker');
		const keys = (await signingKeys.GET({} as never)) as Response;
		expect(keys.status).toBe(200);
		expect((await keys.json()).keys.length).toBeGreaterThan(0);
		// The bystander has its answer; not one bundle check has finished.
		expect(finished).toEqual([]);
		// The held checks keep their two threads: the six share the one kept for short tasks.
		expect(paced.started).toHaveLength(1);
		paced.release();
		const answers = await Promise.all(seals);
		expect(paced.started).toHaveLength(6);
		for (const answer of answers) {
			expect(answer.checked.report.valid).toBe(true);
			expect(answer.checked.record.status).toBe('valid');
		}
	});

	it('refuses a seventh bundle from one address with 429, Retry-After and the usual words', async () => {
		const address = '198.51.100.7';
		const answers = [];
		for (let i = 0; i < 7; i++) {
			const { event, headers } = bundleUpload(address);
			const answer = (await sealPage.actions.bundle(event)) as { status?: number; data?: object };
			answers.push({ answer, headers });
		}
		const refused = answers[6];
		expect(refused.answer.status).toBe(429);
		expect(refused.headers['retry-after']).toMatch(/^\d+$/);
		expect(JSON.stringify(refused.answer.data)).toMatch(
			/Too many bundle checks from your network address\. Try again in \d+ (seconds?|minutes) \(at/
		);
		// Another address is not held up by this one.
		const other = await sealPage.actions.bundle(bundleUpload('198.51.100.8').event);
		expect((other as { status?: number }).status).toBeUndefined();
	}, 600_000);

	it('refuses a third look-up from one address (by ?q= or by the ID page) with 429 and Retry-After', async () => {
		const address = '192.0.2.44';
		const byQuery = sealEvent(
			address,
			new Request(`http://localhost/seal?q=${certificateId}`),
			new URL(`http://localhost/seal?q=${certificateId}`)
		);
		expect(await sealPage.load(byQuery.event)).toMatchObject({ lookup: { status: 'valid' } });
		const byId = sealEvent(address, new Request(`http://localhost/seal/${certificateId}`));
		(byId.event as { params: object }).params = { id: certificateId };
		expect(await sealIdPage.load(byId.event)).toMatchObject({ lookup: { status: 'valid' } });
		const third = await (sealIdPage.load(byId.event) as Promise<unknown>).catch((e: unknown) => e);
		expect(isHttpError(third) && third.status).toBe(429);
		expect(isHttpError(third) && third.body.message).toMatch(
			/^Too many certificate look-ups from your network address\. Try again in/
		);
		expect(byId.headers['retry-after']).toMatch(/^\d+$/);
	});
});
