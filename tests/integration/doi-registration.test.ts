/**
 * Certificate DOIs against a real SQLite file and the REAL local fake registry over HTTP: issue →
 * DOI outbox → registered with the DataCite kernel; the registry down loses nothing and blocks no
 * issue; the resolver redirects to /seal/{id}; superseding and withdrawing update the record.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { dataciteClient, RegistryError } from '../../src/lib/server/certificates/datacite-client';
import { queueMissingDois } from '../../src/lib/server/certificates/doi-backfill';
import { certificateCitation } from '../../src/lib/server/certificates/citation-reads';
import { requeueDoi } from '../../src/lib/server/certificates/doi-outbox';
import { ConflictError } from '../../src/lib/server/core/errors';
import { registerDue, resumeInterruptedDois } from '../../src/lib/server/certificates/doi-sender';
import { writeTransaction } from '../../src/lib/server/db/transactions';
import {
	startFakeRegistry,
	type FakeRegistry
} from '../../src/lib/server/certificates/fake-registry';
import { config } from '../../src/lib/server/core/config';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import {
	certificateFile,
	getCertificate
} from '../../src/lib/server/certificates/certificate-reads';
import { lookupCertificate } from '../../src/lib/server/certificates/certificate-reads';
import { withdrawCertificate } from '../../src/lib/server/certificates/certificate-withdraw';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for issuing (self-check on the work pool) on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let registry: FakeRegistry;
const account = () => ({ ...config().datacite, file: path.join(scratch, 'registry.json') });
const client = () => dataciteClient({ ...account(), url: registry.url });

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-doi-test-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	registry = await startFakeRegistry({ ...account(), port: 0 });
});
afterAll(async () => {
	await registry?.close();
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

/** The record as anyone reads it from the registry's public GET /dois/{doi}. */
async function record(doi: string) {
	const response = await fetch(`${registry.url}/dois/${doi}`);
	expect(response.status).toBe(200);
	return ((await response.json()) as { data: { attributes: Record<string, any> } }).data.attributes;
}

const doiRow = async (id: string) =>
	(await world.database.models.CertificateDoi.findByPk(id))!.get({ plain: true });

let first: { id: string; doi: string };

describe('issuing a certificate', () => {
	it('gives it its DOI at once, printed in the PDF, and registers it through the outbox', async () => {
		const check = await finishedCheck(world, 21);
		const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
		const doi = `${config().datacite.prefix}/rankseal.${cert.id}`;
		expect(cert.doi).toMatchObject({ doi, registration: 'pending' });
		const pdf = await certificateFile(world.database, world.author, cert.id, 'pdf');
		writeFileSync(path.join(scratch, 'c.pdf'), pdf.bytes);
		const text = execFileSync('pdftotext', [path.join(scratch, 'c.pdf'), '-'], {
			encoding: 'utf8'
		});
		expect(text.replace(/\s+/g, '')).toContain(doi);
		// The registry has not heard of it yet: the public record says so honestly.
		expect((await fetch(`${registry.url}/dois/${doi}`)).status).toBe(404);
		expect(await lookupCertificate(world.database, cert.id)).toMatchObject({
			doi: { doi, registration: 'pending' }
		});

		expect(await registerDue(world.database, client())).toEqual({ registered: [doi], failed: [] });
		expect((await getCertificate(world.database, world.author, cert.id)).doi).toMatchObject({
			registration: 'registered'
		});
		first = { id: cert.id, doi };
	});

	it('registers the kernel metadata DataCite requires, Findable, pointing at /seal/{id}', async () => {
		const a = await record(first.doi);
		// The mandatory properties of the DataCite Metadata Schema 4.6 (DataCite Metadata Working
		// Group, 2024, Table 1): Identifier, Creator, Title, Publisher, PublicationYear, ResourceType.
		expect(a.doi).toBe(first.doi);
		expect(a.creators.map((c: { name: string }) => c.name)).toEqual(['Bo Strand', 'Ada Lind']);
		expect(a.titles[0].title).toMatch(/Schmidt-number certificate/);
		expect(a.publisher).toBe('Rankseal');
		expect(a.publicationYear).toBe(new Date().getUTCFullYear());
		expect(a.types.resourceTypeGeneral).toBe('Dataset');
		expect(a.state).toBe('findable');
		expect(a.url).toBe(`https://rankseal.test/seal/${first.id}`);
		// The manuscript (evidence-world's claim cites arXiv:2601.00001), as the schema's arXiv type.
		expect(a.relatedIdentifiers).toEqual([
			{
				relatedIdentifier: 'arXiv:2601.00001',
				relatedIdentifierType: 'arXiv',
				relationType: 'IsSupplementTo'
			}
		]);
		expect(a.descriptions[0].descriptionType).toBe('Abstract');
	});

	it('resolves through the registry to the public record /seal/{id}', async () => {
		const response = await fetch(`${registry.url}/${first.doi}`, { redirect: 'manual' });
		expect(response.status).toBe(302);
		expect(response.headers.get('location')).toBe(`https://rankseal.test/seal/${first.id}`);
		expect((await fetch(`${registry.url}/10.99999/no-such`, { redirect: 'manual' })).status).toBe(
			404
		);
	});
});

let second: { id: string; doi: string };

describe('the registry down, then back', () => {
	it('issues anyway, keeps every change and retries with growing waits', async () => {
		const port = registry.port;
		await registry.close();
		const check = await finishedCheck(world, 22);
		// Issuing is not blocked: the new certificate supersedes the first with the registry down.
		const cert = await issueCertificate(world.database, world.lead, world.claimId, check.id);
		second = { id: cert.id, doi: cert.doi!.doi };
		expect(cert.doi!.registration).toBe('pending');
		expect((await getCertificate(world.database, world.lead, first.id)).doi!.registration).toBe(
			'updating'
		);

		const t0 = new Date('2031-01-01T00:00:00Z');
		const down = await registerDue(world.database, client(), t0);
		expect(down.failed.sort()).toEqual([first.doi, second.doi].sort());
		for (const id of [first.id, second.id]) {
			const row = await doiRow(id);
			expect(row).toMatchObject({ status: 'retrying', attempts: 1 });
			expect(row.lastError).toMatch(/unreachable: ECONNREFUSED/);
			// Exponential back-off from 30 s, the mail outbox's schedule (common practice).
			expect(new Date(row.nextAttemptAt!).getTime() - t0.getTime()).toBe(30_000);
		}
		expect(await registerDue(world.database, client(), new Date(t0.getTime() + 29_999))).toEqual({
			registered: [],
			failed: []
		});

		registry = await startFakeRegistry({ ...account(), port });
		const back = await registerDue(world.database, client(), new Date(t0.getTime() + 30_000));
		expect(back.registered.sort()).toEqual([first.doi, second.doi].sort());
		expect(await registerDue(world.database, client())).toEqual({ registered: [], failed: [] });
	});

	it('links the two versions both ways and marks the older one superseded', async () => {
		const newer = await record(second.doi);
		expect(newer.relatedIdentifiers).toContainEqual({
			relatedIdentifier: first.doi,
			relatedIdentifierType: 'DOI',
			relationType: 'IsNewVersionOf'
		});
		const older = await record(first.doi);
		expect(older.relatedIdentifiers).toContainEqual({
			relatedIdentifier: second.doi,
			relatedIdentifierType: 'DOI',
			relationType: 'IsPreviousVersionOf'
		});
		expect(older.descriptions.map((d: { description: string }) => d.description).join(' ')).toMatch(
			/Superseded by a newer certificate/
		);
	});
});

describe('withdrawing a certificate', () => {
	it('updates its DOI record with the withdrawal date and reason', async () => {
		const reason = 'Detector efficiency was miscalibrated in run 3.';
		const view = await withdrawCertificate(world.database, world.lead, second.id, reason);
		expect(view.doi!.registration).toBe('updating');
		expect((await registerDue(world.database, client())).registered).toEqual([second.doi]);
		const a = await record(second.doi);
		expect(a.dates.map((d: { dateType: string }) => d.dateType)).toEqual(['Issued', 'Withdrawn']);
		expect(a.descriptions.at(-1).description).toContain(reason);
		expect(a.state).toBe('findable');
		expect((await getCertificate(world.database, world.lead, second.id)).doi!.registration).toBe(
			'registered'
		);
	});
});

describe('the fake registry refuses what DataCite would', () => {
	it('answers 401 to wrong credentials and 422 naming each missing kernel property', async () => {
		const wrong = dataciteClient({ ...account(), url: registry.url, password: 'nope' });
		const attributes = { doi: `${config().datacite.prefix}/x`, event: 'publish' } as never;
		await expect(wrong.create(attributes)).rejects.toMatchObject({ status: 401, permanent: true });
		const refused = await client()
			.create(attributes)
			.catch((e: RegistryError) => e);
		expect(refused).toBeInstanceOf(RegistryError);
		expect(refused).toMatchObject({ status: 422, permanent: true });
		for (const property of ['creators', 'titles', 'publisher', 'publicationYear', 'types', 'url'])
			expect((refused as RegistryError).message).toContain(`${property}:`);
		// A draft needs no metadata (DataCite's REST API guide), and is not resolvable.
		const draft = { doi: `${config().datacite.prefix}/draft-1` } as never;
		await client().create(draft);
		expect((await fetch(`${registry.url}/${config().datacite.prefix}/draft-1`)).status).toBe(404);
	});
});

describe('a registration the registry refuses', () => {
	it('is given up at once, shown as failed, and tried afresh at the next start', async () => {
		await writeTransaction(world.database, (t) => requeueDoi(world.database, t, first.id));
		const wrong = dataciteClient({ ...account(), url: registry.url, password: 'nope' });
		expect(await registerDue(world.database, wrong)).toEqual({
			registered: [],
			failed: [first.doi]
		});
		expect(await doiRow(first.id)).toMatchObject({ status: 'failed', nextAttemptAt: null });
		expect((await doiRow(first.id)).lastError).toMatch(/401/);
		expect((await getCertificate(world.database, world.lead, first.id)).doi!.registration).toBe(
			'failed'
		);
		// Given up: no later pass tries it by itself.
		expect(await registerDue(world.database, client())).toEqual({ registered: [], failed: [] });
		expect(await resumeInterruptedDois(world.database)).toBe(1);
		expect(await registerDue(world.database, client())).toEqual({
			registered: [first.doi],
			failed: []
		});
	});
});

describe('a resend after a crash', () => {
	it('turns a create the registry already has into an update, and an update it lacks into a create', async () => {
		const { CertificateDoi } = world.database.models;
		// As if the process stopped after the registry accepted the create, before the mark.
		await writeTransaction(world.database, (t) => requeueDoi(world.database, t, first.id));
		await CertificateDoi.update({ registeredAt: null }, { where: { certificateId: first.id } });
		expect((await registerDue(world.database, client())).registered).toEqual([first.doi]);
		// A registry that lost the record (a fresh fake, no file): the update becomes a create.
		const port = registry.port;
		await registry.close();
		registry = await startFakeRegistry({ ...config().datacite, port });
		await writeTransaction(world.database, (t) => requeueDoi(world.database, t, first.id));
		expect((await registerDue(world.database, client())).registered).toEqual([first.doi]);
		expect((await record(first.doi)).state).toBe('findable');
	});

	it('is refused by the fake as DataCite would: wrong body, foreign prefix, unknown DOI', async () => {
		const auth = `Basic ${Buffer.from(`${account().user}:${account().password}`).toString('base64')}`;
		const send = (method: string, path: string, body: unknown) =>
			fetch(`${registry.url}${path}`, {
				method,
				headers: { authorization: auth, 'content-type': 'application/vnd.api+json' },
				body: JSON.stringify(body)
			});
		const wrongType = await send('POST', '/dois', { data: { type: 'events', attributes: {} } });
		expect(wrongType.status).toBe(400);
		expect((await wrongType.json()).errors[0].source).toBe('data');
		const foreign = await send('POST', '/dois', {
			data: { type: 'dois', attributes: { doi: '10.1234/x' } }
		});
		expect(foreign.status).toBe(403);
		const unknown = await send('PUT', `/dois/${config().datacite.prefix}/nothing`, {
			data: { type: 'dois', attributes: {} }
		});
		expect(unknown.status).toBe(404);
		const taken = await send('POST', '/dois', {
			data: { type: 'dois', attributes: { doi: first.doi } }
		});
		expect(taken.status).toBe(422);
		expect((await taken.json()).errors[0]).toMatchObject({
			source: 'doi',
			title: expect.stringMatching(/taken/)
		});
	});
});

describe('a certificate from before DOIs', () => {
	it('has no DOI or citation until the start-up gives it the same one, then registered', async () => {
		await world.database.models.CertificateDoi.destroy({ where: { certificateId: second.id } });
		expect((await getCertificate(world.database, world.lead, second.id)).doi).toBeNull();
		await expect(
			certificateCitation(world.database, world.lead, second.id, 'text')
		).rejects.toBeInstanceOf(ConflictError);
		expect(await queueMissingDois(world.database)).toBe(1);
		expect(await doiRow(second.id)).toMatchObject({ doi: second.doi, status: 'queued' });
		expect((await registerDue(world.database, client())).registered).toEqual([second.doi]);
		expect(await queueMissingDois(world.database)).toBe(0);
	});
});
