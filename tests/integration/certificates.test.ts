/** Issuing, superseding and withdrawing certificates against a real SQLite file and data folder. */
import { execFileSync } from 'node:child_process';
import {
	existsSync,
	mkdirSync,
	mkdtempSync,
	readdirSync,
	rmSync,
	statSync,
	writeFileSync
} from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { publishedKeys, serviceKey } from '../../src/lib/server/evidence/keys';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { withdrawCertificate } from '../../src/lib/server/certificates/certificate-withdraw';
import {
	certificateFile,
	getCertificate,
	listCertificates,
	lookupCertificate
} from '../../src/lib/server/certificates/certificate-reads';
import { ConflictError, ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import { listLedger } from '../../src/lib/server/ledger/ledger';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { bytesOf, claimFields } from './backend-fixtures';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for bundling, issuing and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let verifierFolder: string;

beforeAll(async () => {
	world = await evidenceWorld();
	verifierFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-verifier-test-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(verifierFolder, 'verify.mjs'));
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(verifierFolder, { recursive: true, force: true });
});

const rowCounts = async () => ({
	certificates: await world.database.models.Certificate.count(),
	ledger: await world.database.models.LedgerEntry.count()
});
const certificateFiles = () => {
	const folder = path.join(world.ctx.folder, 'certificates');
	return existsSync(folder) ? readdirSync(folder).sort() : [];
};

describe('issuing a certificate', () => {
	it('makes the key on first use, owner-only, named by the SHA-256 of its public key', () => {
		const key = serviceKey();
		const file = path.join(world.ctx.folder, 'keys', `${key.id}.json`);
		expect(statSync(file).mode & 0o777).toBe(0o600);
		expect(statSync(path.dirname(file)).mode & 0o777).toBe(0o700);
		expect(publishedKeys()).toEqual([
			expect.objectContaining({ id: key.id, publicKey: key.publicKey, retiredAt: null })
		]);
		expect(JSON.stringify(publishedKeys())).not.toContain(key.secretKey);
	});

	it('issues from a finished check: row, PDF, bundle and ledger entry together', async () => {
		const check = await finishedCheck(world, 7);
		const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
		expect(cert).toMatchObject({
			claimId: world.claimId,
			checkId: check.id,
			status: 'valid',
			supersedes: null,
			supersededBy: null,
			certifiedSchmidtNumber: check.result.certifiedSchmidtNumber,
			urls: { pdf: `/api/v1/certificates/${cert.id}/pdf`, verify: `/seal/${cert.id}` }
		});
		expect(cert.fingerprint).toMatch(/^[0-9a-f]{64}$/);
		expect(certificateFiles()).toEqual([`${cert.id}.pdf`, `${cert.id}.zip`]);
		const ledger = await listLedger(world.database);
		expect(ledger.items.map((e) => [e.seq, e.event, e.certificateId])).toEqual([
			[1, 'issue', cert.id]
		]);
		expect(await verifyLedger(world.database)).toMatchObject({
			valid: true,
			entries: 1,
			certificates: 1
		});
		expect((await world.database.models.Claim.findByPk(world.claimId))!.get('state')).toBe(
			'certified'
		);
	});

	it('writes a PDF whose text (pdftotext) holds the id, fingerprint, certified Schmidt number and verdict', async () => {
		const [cert] = await listCertificates(world.database, world.author, world.claimId);
		const pdf = await certificateFile(world.database, world.author, cert.id, 'pdf');
		const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-pdf-'));
		writeFileSync(path.join(folder, 'c.pdf'), pdf.bytes);
		const text = execFileSync('pdftotext', ['-layout', path.join(folder, 'c.pdf'), '-'], {
			encoding: 'utf8'
		});
		rmSync(folder, { recursive: true, force: true });
		expect(text).toContain(cert.id);
		expect(text).toContain(cert.fingerprint);
		expect(text).toContain(`Certified Schmidt number: ${cert.certifiedSchmidtNumber}`);
		expect(text).toContain(`Verdict on the claimed 3: ${cert.verdict}`);
		expect(text).toMatch(/device-dependent/);
		expect(text).toMatch(/Raw counts/);
		expect(text).toMatch(/page 1 of \d/);
		expect(pdf.bytes.subarray(0, 5).toString()).toBe('%PDF-');
		expect(pdf.bytes.toString('latin1')).toMatch(/\/FontName \/[A-Z]{6}\+NotoSerif/);
	});

	it('supersedes the earlier certificate: both readable, linked both ways, ledger intact', async () => {
		const [first] = await listCertificates(world.database, world.author, world.claimId);
		const check = await finishedCheck(world, 8);
		const second = await issueCertificate(world.database, world.lead, world.claimId, check.id);
		expect(second.supersedes).toBe(first.id);
		expect(await getCertificate(world.database, world.author, first.id)).toMatchObject({
			status: 'superseded',
			supersededBy: second.id,
			fingerprint: first.fingerprint
		});
		expect(await lookupCertificate(world.database, first.fingerprint)).toMatchObject({
			id: first.id,
			status: 'superseded',
			supersededBy: second.id
		});
		expect(await lookupCertificate(world.database, 'f'.repeat(64))).toEqual({ status: 'unknown' });
		const events = (await listLedger(world.database)).items.map((e) => [e.event, e.certificateId]);
		expect(events).toEqual([
			['issue', first.id],
			['issue', second.id],
			['supersede', first.id]
		]);
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true, entries: 3 });
	});

	it('shows nothing to another group and refuses an unfinished check, storing nothing', async () => {
		const check = await finishedCheck(world, 9);
		const before = { ...(await rowCounts()), files: certificateFiles() };
		await expect(
			issueCertificate(world.database, world.outsider, world.claimId, check.id)
		).rejects.toBeInstanceOf(NotFoundError);
		await world.database.models.Check.update({ status: 'running' }, { where: { id: check.id } });
		await expect(
			issueCertificate(world.database, world.author, world.claimId, check.id)
		).rejects.toBeInstanceOf(ConflictError);
		const [cert] = await listCertificates(world.database, world.author, world.claimId);
		await expect(getCertificate(world.database, world.outsider, cert.id)).rejects.toBeInstanceOf(
			NotFoundError
		);
		expect({ ...(await rowCounts()), files: certificateFiles() }).toEqual(before);
	});

	it('refuses a check whose stored result the engine does not reproduce', async () => {
		const check = await finishedCheck(world, 10);
		const altered = {
			...check.result,
			certifiedSchmidtNumber: check.result.certifiedSchmidtNumber + 1
		};
		await world.database.models.Check.update({ result: altered }, { where: { id: check.id } });
		const before = await rowCounts();
		await expect(
			issueCertificate(world.database, world.author, world.claimId, check.id)
		).rejects.toThrow(/re-run: certifiedSchmidtNumber/);
		expect(await rowCounts()).toEqual(before);
	});

	it('leaves no row, no file and no ledger entry when storing the files fails inside the transaction', async () => {
		const check = await finishedCheck(world, 11);
		const before = { ...(await rowCounts()), files: certificateFiles() };
		const [current] = await listCertificates(world.database, world.author, world.claimId);
		// A file where the certificates folder belongs makes placing the files fail after the rows are written.
		const blocker = path.join(world.ctx.folder, 'certificates');
		const moved = `${blocker}.aside`;
		mkdirSync(blocker, { recursive: true });
		execFileSync('mv', [blocker, moved]);
		writeFileSync(blocker, 'not a folder');
		try {
			await expect(
				issueCertificate(world.database, world.author, world.claimId, check.id)
			).rejects.toThrow();
		} finally {
			rmSync(blocker, { force: true });
			execFileSync('mv', [moved, blocker]);
		}
		expect({ ...(await rowCounts()), files: certificateFiles() }).toEqual(before);
		expect(await getCertificate(world.database, world.author, current.id)).toMatchObject({
			status: 'valid',
			supersededBy: null
		});
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
	});
});

describe('the Fourier convention', () => {
	it('records a field-convention claim in d = 4 and reproduces it with that convention', async () => {
		const claim = await createClaim(world.database, world.author, {
			...claimFields,
			title: 'Field Fourier basis, d = 4',
			dimension: 4,
			fourier: 'field'
		});
		const counts = sampledCounts(states.isotropic(4, 0.9), [0, 1], 40_000, 5, 'field');
		const dataset = await addDataset(world.database, world.author, claim.id, {
			bytes: bytesOf(toCountsCsv(counts)),
			originalName: 'field.csv'
		});
		const on = { claimId: claim.id, datasetId: dataset.id };
		const check = await finishedCheck(world, 41, 400, on);
		expect(check.result.fourier).toBe('field');
		const cert = await issueCertificate(world.database, world.author, claim.id, check.id);
		const bundle = await certificateFile(world.database, world.author, cert.id, 'bundle');
		const files = readZip(bundle.bytes);
		const manifest = JSON.parse(new TextDecoder().decode(files['manifest.json']));
		expect(manifest.claim.fourier).toBe('field');
		expect(verifyEvidence(files)).toMatchObject({ valid: true });
	});
});

describe('withdrawing', () => {
	it('lets the lead or the issuer withdraw, records the reason in the ledger, and nobody else', async () => {
		const check = await finishedCheck(world, 12);
		const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
		const other = await issueCertificate(
			world.database,
			world.author,
			world.claimId,
			(await finishedCheck(world, 13)).id
		);
		await expect(
			withdrawCertificate(world.database, world.outsider, other.id, 'wrong data')
		).rejects.toBeInstanceOf(NotFoundError);
		const withdrawn = await withdrawCertificate(
			world.database,
			world.lead,
			other.id,
			'wrong counts file'
		);
		expect(withdrawn.status).toBe('withdrawn');
		expect(cert.id).not.toBe(other.id);
		const last = (await listLedger(world.database, 1, 200)).items.at(-1)!;
		expect(last).toMatchObject({ event: 'withdraw', certificateId: other.id });
		expect(JSON.parse(last.payload).details.reason).toBe('wrong counts file');
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
	});

	it('refuses a withdrawal by an author who did not issue it', async () => {
		const [latest] = await listCertificates(world.database, world.lead, world.claimId);
		const byLead = await issueCertificate(
			world.database,
			world.lead,
			world.claimId,
			(await finishedCheck(world, 14)).id
		);
		expect(latest.id).not.toBe(byLead.id);
		await expect(
			withdrawCertificate(world.database, world.author, byLead.id, 'not mine')
		).rejects.toBeInstanceOf(ForbiddenError);
	});
});
