/**
 * Issue 15 §1 against a real SQLite file and the real check runner: the record of every analysis
 * of one counts file (matched by its canonical SHA-256 across the claims of a group), the derived
 * seed, the declared analysis, and the Bonferroni-corrected level of an exploratory certificate.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { parseCounts } from '../../src/lib/certify';
import { derivedSeed } from '../../src/lib/evidence/analyses';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { BUNDLE_FILES, contentsText, type EvidenceFiles } from '../../src/lib/evidence/layout';
import { signText } from '../../src/lib/evidence/signing';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { serviceKey } from '../../src/lib/server/evidence/keys';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { canonicalCountsText, type EvidenceManifest } from '../../src/lib/evidence/manifest';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import type { UserActor } from '../../src/lib/server/core/actor';
import {
	certificateFile,
	getCertificate,
	lookupCertificate
} from '../../src/lib/server/certificates/certificate-reads';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim } from '../../src/lib/server/claims/claims';
import { countsRecord } from '../../src/lib/server/datasets/counts-record';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { NotFoundError } from '../../src/lib/server/core/errors';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { temporaryDatabase } from './db';

// Safety limits for bundling and real checks on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let workerFolder: string;
let author: UserActor, outsider: UserActor;
const csv = countsCsv(5, [0, 1, 2], 40_000, 21);
const settings = { confidence: 0.99, resamples: 400 };

/** The same numbers in the JSON layout: a different file, the same counts. */
function asJson(text: string): string {
	const data = parseCounts(bytesOf(text), 5);
	const tables = data.tables.map((t) => ({
		basis: t.basis,
		counts: Array.from({ length: 5 }, (_, a) => Array.from(t.counts.subarray(a * 5, a * 5 + 5)))
	}));
	return JSON.stringify({ dimension: 5, tables });
}

async function claimWith(actor: UserActor, bytes: Uint8Array, bases: number[], name: string) {
	const claim = await createClaim(ctx.database, actor, { ...claimFields, bases });
	const dataset = await addDataset(ctx.database, actor, claim.id, { bytes, originalName: name });
	return { claimId: claim.id, datasetId: dataset.id };
}

async function ran(actor: UserActor, claimId: string, request: Record<string, number> = {}) {
	const check = await startCheck(ctx.database, actor, claimId, { ...settings, ...request });
	await (await startCheckRunner(ctx.database)).idle();
	return getCheck(ctx.database, actor, check.id);
}

async function certified(actor: UserActor, claimId: string, checkId: string) {
	const issued = await issueCertificate(ctx.database, actor, claimId, checkId);
	const row = await ctx.database.models.Certificate.findByPk(issued.id);
	const manifest = JSON.parse(row!.get('manifest') as string) as EvidenceManifest;
	return { view: await getCertificate(ctx.database, actor, issued.id), manifest };
}

/** The PDF's text as poppler's pdftotext reads it. */
function pdfText(bytes: Uint8Array): string {
	const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-pdf-'));
	writeFileSync(path.join(folder, 'c.pdf'), bytes);
	const text = execFileSync('pdftotext', [path.join(folder, 'c.pdf'), '-'], { encoding: 'utf8' });
	rmSync(folder, { recursive: true, force: true });
	return text;
}

const utf8 = (text: string) => new TextEncoder().encode(text);
const decode = (bytes: Uint8Array) => new TextDecoder().decode(bytes);

/** Writes the manifest back and signs it and the file list with the service's own key. */
function resign(files: EvidenceFiles, manifest: EvidenceManifest) {
	const key = serviceKey();
	const text = canonicalJson(manifest);
	files[BUNDLE_FILES.manifest] = utf8(text);
	files[BUNDLE_FILES.signature] = utf8(signText(text, key.secretKey) + '\n');
	const listed = contentsText(manifest.certificateId, sha256Hex(text), files);
	files[BUNDLE_FILES.contents] = utf8(listed);
	files[BUNDLE_FILES.contentsSignature] = utf8(signText(listed, key.secretKey) + '\n');
}

beforeAll(async () => {
	ctx = await temporaryDatabase();
	workerFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-analyses-worker-'));
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.ORIGIN = 'https://rankseal.test';
	process.env.RANKSEAL_CHECK_WORKERS = '1';
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(
		path.join(workerFolder, 'check-worker.mjs')
	);
	const lake = await addGroup(ctx.database, 'Halvorsen Lake Photonics');
	const ridge = await addGroup(ctx.database, 'Ridge qudits');
	author = asUser(await addUser(ctx.database, 'Ingrid Halvorsen', [[lake, 'author']]));
	outsider = asUser(await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]));
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
	rmSync(workerFolder, { recursive: true, force: true });
});

describe('analyses of one counts file', () => {
	let first: { claimId: string; datasetId: string };
	const countsSha256 = sha256Hex(canonicalCountsText(parseCounts(bytesOf(csv), 5)));

	it('derives the default seed from the counts and the settings: a re-run gives the same numbers', async () => {
		first = await claimWith(author, bytesOf(csv), [0, 1, 2], 'run.csv');
		const a = await ran(author, first.claimId);
		const b = await ran(author, first.claimId);
		const expected = derivedSeed(countsSha256, {
			method: 'mub-correlation',
			bases: [0, 1, 2],
			fourier: 'cyclic',
			...settings,
			subtractAccidentals: false
		});
		expect(a.seed).toBe(expected);
		expect(b.seed).toBe(expected);
		expect(b.result).toEqual(a.result);
		// Other settings, another seed: a seed is not something to shop for by default.
		expect((await ran(author, first.claimId, { confidence: 0.95 })).seed).not.toBe(expected);
	});

	it('states every distinct analysis; the declared one alone would keep full confidence', async () => {
		const claim = await claimWith(
			author,
			bytesOf(countsCsv(5, [0, 1, 2], 40_000, 22)),
			[0, 1, 2],
			'other.csv'
		);
		const check = await ran(author, claim.claimId);
		const { view, manifest } = await certified(author, claim.claimId, check.id);
		expect(view.analyses).toMatchObject({ total: 1, declared: true, exploratory: false });
		expect(view.analyses!.statedConfidence).toBe(0.99);
		expect(view.certifiedSchmidtNumber).toBe(check.result!.certifiedSchmidtNumber);
		expect(manifest.analyses!.list).toEqual([
			expect.objectContaining({ bases: [0, 1, 2], confidence: 0.99, seed: 'derived' })
		]);
	});

	it('counts a re-run as nothing new, a chosen seed and a new confidence each as one more', async () => {
		const chosen = await ran(author, first.claimId, { seed: 12345 });
		const { view, manifest } = await certified(author, first.claimId, chosen.id);
		// Derived at 0.99 (run twice), derived at 0.95, seed 12345 at 0.99.
		expect(view.analyses).toMatchObject({ total: 3, declared: true, exploratory: true });
		expect(view.analyses!.statedConfidence).toBe(1 - 0.01 / 3);
		expect(manifest.parameters.confidence).toBe(1 - 0.01 / 3);
		expect(manifest.result.confidence).toBe(1 - 0.01 / 3);
		expect(manifest.analyses!.list.map((a) => [a.confidence, a.seed])).toEqual([
			[0.99, 'derived'],
			[0.95, 'derived'],
			[0.99, 12345]
		]);
		// The PDF and the public record (/seal) say the same.
		const text = pdfText((await certificateFile(ctx.database, author, view.id, 'pdf')).bytes);
		expect(text).toContain('Distinct analyses up to this certificate: 3');
		expect(text.replace(/\s+/g, ' ')).toContain(
			`stated at confidence ${1 - 0.01 / 3} = 1 − (1 − 0.99)/3 (Bonferroni)`
		);
		expect(text).toContain(
			'3. mub-correlation, bases 0 1 2, cyclic, confidence 0.99, 400 resamples, seed 12345'
		);
		const record = await lookupCertificate(ctx.database, view.id);
		expect(record).toMatchObject({ analyses: { total: 3, declared: true, exploratory: true } });
	});

	it('matches the same counts uploaded to another claim of the group in another layout', async () => {
		const json = await claimWith(author, bytesOf(asJson(csv)), [0, 1], 'run.json');
		const rows = await ctx.database.models.Dataset.findAll({
			where: { id: [first.datasetId, json.datasetId] }
		});
		const [x, y] = rows.map((r) => r.get({ plain: true }));
		expect(x.sha256).not.toBe(y.sha256);
		expect(x.countsSha256).toBe(countsSha256);
		expect(y.countsSha256).toBe(countsSha256);
		const check = await ran(author, json.claimId);
		const { view } = await certified(author, json.claimId, check.id);
		// This claim's declared analysis, yet the fourth of these counts: exploratory.
		expect(view.analyses).toMatchObject({ total: 4, declared: true, exploratory: true });
		expect(view.analyses!.statedConfidence).toBe(1 - 0.01 / 4);
	});

	it('has its bundle refused by the verifier when the stated level is not the corrected one', async () => {
		const check = await ran(author, first.claimId, { seed: 999 });
		const { view } = await certified(author, first.claimId, check.id);
		const bundle = await certificateFile(ctx.database, author, view.id, 'bundle');
		const files = readZip(bundle.bytes);
		expect(verifyEvidence(files)).toMatchObject({ valid: true });
		const manifest = JSON.parse(decode(files[BUNDLE_FILES.manifest])) as EvidenceManifest;
		// A re-signed bundle that hides the other analyses keeps its corrected numbers: refused.
		const hidden = { ...manifest.analyses!, total: 1, list: manifest.analyses!.list.slice(-1) };
		resign(files, { ...manifest, analyses: hidden });
		expect(verifyEvidence(files)).toMatchObject({ valid: false, failedItem: 'analyses' });
	});

	it('keeps the record of every check on the counts, for members of the group only', async () => {
		const record = await countsRecord(ctx.database, author, first.datasetId);
		expect(record.countsSha256).toBe(countsSha256);
		// first: 0.99 twice, 0.95, seed 12345, seed 999; the JSON claim's own check: 6 checks.
		expect(record.runs).toHaveLength(6);
		expect(record.distinct).toBe(5);
		expect(record.runs.every((r) => r.ranByName === 'Ingrid Halvorsen')).toBe(true);
		expect(new Set(record.runs.map((r) => r.settings.bases.join(' ')))).toEqual(
			new Set(['0 1 2', '0 1'])
		);
		await expect(countsRecord(ctx.database, outsider, first.datasetId)).rejects.toBeInstanceOf(
			NotFoundError
		);
	});

	it("leaves another group's analyses of the same counts out", async () => {
		const theirs = await claimWith(outsider, bytesOf(csv), [0, 1, 2], 'run.csv');
		const check = await ran(outsider, theirs.claimId);
		const { view } = await certified(outsider, theirs.claimId, check.id);
		expect(view.analyses).toMatchObject({ total: 1, declared: true, exploratory: false });
	});
});
