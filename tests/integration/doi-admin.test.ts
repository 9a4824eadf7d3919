/**
 * The DOI outbox for admins against a real SQLite file and the REAL local fake registry over HTTP:
 * only admins list registrations or retry one; a registration the registry refuses shows as given
 * up with its reason; "try again now" re-queues it (same revision, attempts from 0, no error) and
 * wakes the sender after commit, which registers it once the registry answers again; a registered
 * or already waiting one is refused with a conflict, an unknown one is not found.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import {
	dataciteClient,
	type DataciteClient
} from '../../src/lib/server/certificates/datacite-client';
import { listDoiRegistrations, retryDoiNow } from '../../src/lib/server/certificates/doi-admin';
import { onDoiQueued, requeueDoi } from '../../src/lib/server/certificates/doi-outbox';
import { registerDue } from '../../src/lib/server/certificates/doi-sender';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import {
	startFakeRegistry,
	type FakeRegistry
} from '../../src/lib/server/certificates/fake-registry';
import {
	startBackgroundLoop,
	type BackgroundLoop
} from '../../src/lib/server/core/background-loop';
import { config } from '../../src/lib/server/core/config';
import type { UserActor } from '../../src/lib/server/core/actor';
import type { CertificateDoiAttributes } from '../../src/lib/server/db/models/CertificateDoi';
import { writeTransaction } from '../../src/lib/server/db/transactions';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { problemOf } from '../../src/lib/server/http/problems';
import { asUser } from './actors';
import { addUser } from './backend-fixtures';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for issuing (self-check on the work pool) on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let registry: FakeRegistry;
let admin: UserActor;
let certificateId = '';
const account = () => ({ ...config().datacite, file: path.join(scratch, 'registry.json') });
const client = () => dataciteClient({ ...account(), url: registry.url });
/** The registry's answer to wrong credentials is 401, which the sender takes as final. */
const refusing = () => dataciteClient({ ...account(), url: registry.url, password: 'nope' });

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-doi-admin-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	registry = await startFakeRegistry({ ...account(), port: 0 });
	const adminId = await addUser(world.database, 'Eli Moss');
	await world.database.models.User.update({ accountRole: 'admin' }, { where: { id: adminId } });
	admin = asUser(adminId, 'admin');
});
afterAll(async () => {
	await registry?.close();
	await world?.ctx.close();
	if (scratch) rmSync(scratch, { recursive: true, force: true });
});

const doiRow = async (id: string): Promise<CertificateDoiAttributes> =>
	(await world.database.models.CertificateDoi.findByPk(id))!.get({ plain: true });
const refusal = (promise: Promise<unknown>) => promise.then(() => null, problemOf);

describe('who may see and retry DOI registrations', () => {
	it('refuses everyone but an admin with 403, naming the reason', async () => {
		for (const actor of [world.lead, world.author, world.outsider]) {
			expect(await refusal(listDoiRegistrations(world.database, actor))).toMatchObject({
				status: 403,
				message: 'Only admins may see the DOI registrations.'
			});
			expect(await refusal(retryDoiNow(world.database, actor, 'any'))).toMatchObject({
				status: 403,
				message: 'Only admins may send a DOI registration again.'
			});
		}
		expect(await listDoiRegistrations(world.database, admin)).toEqual({
			items: [],
			total: 0,
			page: 1,
			pageSize: 50
		});
	});
});

describe('a registration the registry refuses', () => {
	it('is listed as given up, with its reason, its attempts and the claim it certifies', async () => {
		const check = await finishedCheck(world, 31);
		const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
		certificateId = cert.id;
		expect(await registerDue(world.database, refusing())).toEqual({
			registered: [],
			failed: [cert.doi!.doi]
		});
		const claim = await world.database.models.Claim.findByPk(world.claimId);
		const { items, total } = await listDoiRegistrations(world.database, admin);
		expect(total).toBe(1);
		expect(items[0]).toMatchObject({
			certificateId,
			doi: cert.doi!.doi,
			claimTitle: claim!.get('title'),
			status: 'failed',
			revision: 1,
			sentRevision: 0,
			attempts: 1,
			nextAttemptAt: null,
			registeredAt: null
		});
		expect(items[0].lastError).toMatch(/401/);
		expect((await listDoiRegistrations(world.database, admin, 1, 'failed')).total).toBe(1);
		expect((await listDoiRegistrations(world.database, admin, 1, 'done')).total).toBe(0);
	});

	it('is queued afresh by "try again now" and registered by the woken sender', async () => {
		const found: CertificateDoiAttributes[] = [];
		let waiters: (() => void)[] = [];
		const sender: DataciteClient = client();
		// A loop as the app runs it: woken by onDoiQueued only (its timer is an hour away).
		const loop: BackgroundLoop = startBackgroundLoop({
			pass: async (keepGoing) => {
				found.push(await doiRow(certificateId));
				await registerDue(world.database, sender, new Date(), keepGoing);
				waiters.splice(0).forEach((done) => done());
			},
			subscribe: onDoiQueued,
			pollMs: 3_600_000,
			label: 'test DOI sender'
		});
		/** Resolves once a finished pass has left the row in `status` (passes, not time). */
		const whenRow = async (status: string) => {
			for (;;) {
				const nextPass = new Promise<void>((done) => waiters.push(done));
				if ((await doiRow(certificateId)).status === status) return;
				await nextPass;
			}
		};
		// The loop's first pass (at its start) finds nothing due: a given-up row waits for a person.
		const firstPass = new Promise<void>((done) => waiters.push(done));
		try {
			await firstPass;
			expect(found).toHaveLength(1);
			expect(found[0].status).toBe('failed');
			await retryDoiNow(world.database, admin, certificateId);
			await whenRow('done');
		} finally {
			await loop.stop(2000);
			waiters = [];
		}
		// What the woken pass found: queued, due, attempts from 0, no error, the same revision.
		const woken = found.find((row) => row.status === 'queued')!;
		expect(woken).toMatchObject({ attempts: 0, lastError: null, revision: 1, sentRevision: 0 });
		expect(new Date(woken.nextAttemptAt!).getTime()).toBeLessThanOrEqual(Date.now());
		const [item] = (await listDoiRegistrations(world.database, admin)).items;
		expect(item).toMatchObject({ status: 'done', revision: 1, sentRevision: 1, lastError: null });
		expect(item.registeredAt).not.toBeNull();
		const record = await fetch(`${registry.url}/dois/${item.doi}`);
		expect(record.status).toBe(200);
	});
});

describe('"try again now" where it does not apply', () => {
	it('refuses a registered or waiting registration (409) and an unknown one (404)', async () => {
		expect(await refusal(retryDoiNow(world.database, admin, certificateId))).toMatchObject({
			status: 409,
			message: expect.stringMatching(/already holds/)
		});
		await writeTransaction(world.database, (t) => requeueDoi(world.database, t, certificateId));
		expect(await refusal(retryDoiNow(world.database, admin, certificateId))).toMatchObject({
			status: 409,
			message: expect.stringMatching(/already waiting/)
		});
		expect(await refusal(retryDoiNow(world.database, admin, 'no-such-id'))).toMatchObject({
			status: 404
		});
		expect((await doiRow(certificateId)).revision).toBe(2);
	});

	it('brings a registration waiting for its next try forward to now', async () => {
		// A closed port: the registry ran there a moment ago.
		const gone = await startFakeRegistry({ ...account(), port: 0 });
		await gone.close();
		const down = dataciteClient({ ...account(), url: gone.url });
		const t0 = new Date();
		await registerDue(world.database, down, t0);
		const waiting = await doiRow(certificateId);
		expect(waiting).toMatchObject({ status: 'retrying', attempts: 1 });
		expect(new Date(waiting.nextAttemptAt!).getTime()).toBe(t0.getTime() + 30_000);
		await retryDoiNow(world.database, admin, certificateId);
		const now = await doiRow(certificateId);
		expect(now).toMatchObject({ status: 'queued', attempts: 0, lastError: null, revision: 2 });
		expect(new Date(now.nextAttemptAt!).getTime()).toBeLessThan(t0.getTime() + 30_000);
		expect((await registerDue(world.database, client())).registered).toEqual([waiting.doi]);
	});
});
