/**
 * Certificates from time-ordered trials (issue 20, part 2) against a real SQLite file, the real
 * check runner (bundled worker), the bundled verify.mjs run with Node, `npm run verify`, the PDF
 * read back with poppler, /seal's record and a referee's re-run from a review link.
 * Expected numbers come from the engine called directly (its own tests tie it to witnesses.md §10).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import { render } from 'svelte/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { isotropicTrialsCsv, type TrialsResult } from '../../src/lib/certify/trials';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { BUNDLE_FILES, type EvidenceFiles } from '../../src/lib/evidence/layout';
import type { TrialsManifest } from '../../src/lib/evidence/trials-evidence';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import type { RefereeActor } from '../../src/lib/server/core/actor';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import {
	certificateFile,
	lookupCertificate
} from '../../src/lib/server/certificates/certificate-reads';
import {
	issueCertificate,
	type CertificateView
} from '../../src/lib/server/certificates/certificates';
import { getCheck, listChecks, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { ConflictError } from '../../src/lib/server/core/errors';
import { refereeCheck, refereeView, startRefereeCheck } from '../../src/lib/server/review/referee';
import { createReviewLink } from '../../src/lib/server/review/review-links';
import { refereeFor } from '../../src/lib/server/review/review-use';
import { shareClaim } from '../../src/lib/server/review/shares';
import { asUser } from './actors';
import { addEditor, addGroup, addUser, bytesOf, claimFields } from './backend-fixtures';
import ReRuns from '../../src/routes/review/[token]/ReRuns.svelte';
import ReviewPage from '../../src/routes/review/[token]/+page.svelte';
import SealRecord from '../../src/routes/seal/SealRecord.svelte';
import { forgeBundle } from './forgery';
import { mailTo, mailWorld, type MailWorld } from './mail-world';

// Safety limits for bundling, checks and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 900_000 });

const D = 5;
const csv = isotropicTrialsCsv(D, 0.95, [0, 1], 4000, 7);
const utf8 = (text: string) => new TextEncoder().encode(text);
const decode = (bytes: Uint8Array) => new TextDecoder().decode(bytes);

let world: MailWorld;
let tools: string;
let author: string;
let editorEmail: string;
let editor: string;
let claimId: string;
let checkId: string;
let certificate: CertificateView;
let zip: Buffer;
let files: EvidenceFiles;

async function idle() {
	await (await startCheckRunner(world.database)).idle();
}

/** Writes files into a fresh folder and returns it. */
function unpack(contents: EvidenceFiles): string {
	const dir = mkdtempSync(path.join(tools, 'bundle-'));
	for (const [name, bytes] of Object.entries(contents)) writeFileSync(path.join(dir, name), bytes);
	return dir;
}

beforeAll(async () => {
	world = await mailWorld();
	tools = mkdtempSync(path.join(tmpdir(), 'rankseal-trials-cert-'));
	process.env.RANKSEAL_DATA_DIR = world.folder;
	process.env.ORIGIN = 'http://rankseal.test';
	process.env.RANKSEAL_CHECK_WORKERS = '1';
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(path.join(tools, 'worker.mjs'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(tools, 'verify.mjs'));
	const lake = await addGroup(world.database, 'Halvorsen Lake Photonics');
	author = await addUser(world.database, 'Ada Lind', [[lake, 'author']]);
	({ id: editor, email: editorEmail } = await addEditor(world.database, 'Eda Kern'));
	const fields = { ...claimFields, dimension: D, claimedSchmidtNumber: 3 };
	const claim = await createClaim(world.database, asUser(author), {
		...fields,
		trialsMode: 'trials',
		trialsProbabilities: [0.5, 0.5]
	});
	claimId = claim.id;
	await addDataset(world.database, asUser(author), claimId, {
		bytes: gzipSync(bytesOf(csv)),
		originalName: 'halvorsen-run.csv.gz'
	});
	checkId = (await startCheck(world.database, asUser(author), claimId, {})).id;
	await idle();
	certificate = await issueCertificate(world.database, asUser(author), claimId, checkId);
	zip = (await certificateFile(world.database, asUser(author), certificate.id, 'bundle')).bytes;
	files = await readZip(zip);
});
afterAll(async () => {
	await stopCheckRunner(world.database);
	await world.close();
	rmSync(tools, { recursive: true, force: true });
});

describe('a certificate from time-ordered trials', () => {
	it('is issued; the signed manifest carries the kind, mode, probabilities, p_r per rung, betting rule, settings check and assumption', async () => {
		const check = await getCheck(world.database, asUser(author), checkId);
		const recorded = check.result as unknown as TrialsResult;
		const m = JSON.parse(decode(files[BUNDLE_FILES.manifest])) as TrialsManifest;
		expect(m.trials).toMatchObject({
			kind: 'time-ordered-trials',
			mode: 'trials',
			uploadedName: 'trials-uploaded.csv.gz',
			gzip: true
		});
		expect(m.trials.assumption).toMatch(
			/chosen at random with the declared probabilities, independently of the source and of the past/
		);
		// The declared analysis alone: the certificate states the check's own result, every bit.
		expect(m.result).toEqual(recorded);
		expect(m.result.probabilities).toEqual([0.5, 0.5]);
		expect(m.result.rungs.map((r) => r.rung)).toEqual([1, 2, 3, 4]);
		expect(m.result.betting.rule).toBe('aGRAPA');
		expect(m.result.settings.passed).toBe(true);
		expect(certificate).toMatchObject({
			kind: 'time-ordered-trials',
			assumption: m.trials.assumption,
			certifiedSchmidtNumber: recorded.certifiedSchmidtNumber
		});
		// The file exactly as uploaded (gzip), its SHA-256 in the manifest.
		expect(gunzipSync(files['trials-uploaded.csv.gz']).toString('utf8')).toBe(csv);
		expect(m.counts.uploadedSha256).toBe(sha256Hex(files['trials-uploaded.csv.gz']));
		expect(decode(files[BUNDLE_FILES.result])).toBe(canonicalJson(m.result));
	});

	it('states its kind and the assumption in words on the PDF (read back with pdftotext)', async () => {
		const pdf = (await certificateFile(world.database, asUser(author), certificate.id, 'pdf'))
			.bytes;
		const file = path.join(tools, 'certificate.pdf');
		writeFileSync(file, pdf);
		const text = execFileSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' })
			.replace(/\s+/g, ' ')
			.replace(/- /g, '-');
		expect(text).toMatch(/Certificate kind: time-ordered trials, test supermartingale/);
		expect(text).toMatch(/valid without the i\.i\.d\. assumption/);
		expect(text).toMatch(/independently of the source and of the past/);
		expect(text).toMatch(/aGRAPA/);
		expect(text).toMatch(/Settings randomness check: passed/);
		expect(text).toMatch(/p-values per rung/);
	});

	it('tells the author by mail that it is from time-ordered trials', async () => {
		const email = (await world.database.models.User.findByPk(author))!.get('email') as string;
		const mail = (await mailTo(world, email)).find((m) => m.text.includes(certificate.fingerprint));
		expect(mail?.text.replace(/\s+/g, ' ')).toMatch(
			/from time-ordered trials, without the i\.i\.d\. assumption/
		);
	});

	it('/seal shows the kind and the assumption', async () => {
		const record = await lookupCertificate(world.database, certificate.id);
		expect(record).toMatchObject({
			status: 'valid',
			kind: 'time-ordered-trials',
			backgroundSubtracted: false
		});
		expect('assumption' in record && record.assumption).toMatch(/independently of the source/);
		// The /seal record as the server renders it.
		const { body } = render(SealRecord, { props: { lookup: record } });
		expect(body).toMatch(
			/data-testid="seal-kind"[^>]*>\s*Time-ordered trials \(test supermartingale\)/
		);
		expect(body).toContain('time-ordered trials');
	});

	it('verifies offline: the bundle’s own verify.mjs and `npm run verify` re-run the supermartingale from the gzip file', () => {
		const dir = unpack(files);
		const key = ['--key-fingerprint', certificate.keyId];
		const own = spawnSync(process.execPath, ['verify.mjs', ...key], { cwd: dir, encoding: 'utf8' });
		expect(own.stdout).toMatch(/PASS/);
		expect(own.status).toBe(0);
		const zipFile = path.join(tools, 'bundle.zip');
		writeFileSync(zipFile, zip);
		const cli = spawnSync(process.execPath, ['scripts/cli.mjs', 'verify', zipFile, ...key], {
			encoding: 'utf8'
		});
		expect(cli.stdout).toMatch(/PASS/);
		expect(cli.status).toBe(0);
		expect(verifyEvidence(files).passed).toContain('trials-uploaded.csv.gz (manifest hash)');
	});

	it('refuses a changed trial row: by its hash as it stands, and by the re-run once re-signed', () => {
		const name = 'trials-uploaded.csv.gz';
		const rows = csv.split('\n');
		// A matching row swapped with the next, non-matching one of the same basis, early in the run:
		// the summed counts are the same, only the time order (and so every later bet) differs.
		const cells = (row: string) => row.split(',');
		const matches = (row: string) => cells(row)[1] === cells(row)[2];
		const i = rows.findIndex(
			(r, k) =>
				k > 0 && matches(r) && !matches(rows[k + 1]) && cells(r)[0] === cells(rows[k + 1])[0]
		);
		[rows[i], rows[i + 1]] = [rows[i + 1], rows[i]];
		const tampered = gzipSync(utf8(rows.join('\n')));
		const plain = verifyEvidence({ ...files, [name]: tampered });
		expect(plain).toMatchObject({ valid: false, failedItem: name });
		// A forger re-signs everything with a key of their own and fixes the hashes in the manifest.
		const m = JSON.parse(decode(files[BUNDLE_FILES.manifest])) as TrialsManifest;
		const sha = sha256Hex(tampered);
		const manifest = {
			...m,
			counts: { ...m.counts, uploadedSha256: sha, uploadedBytes: tampered.byteLength },
			result: { ...m.result, inputSha256: sha, iid: { ...m.result.iid, inputSha256: sha } }
		};
		const edited = {
			...files,
			[name]: tampered,
			[BUNDLE_FILES.manifest]: utf8(canonicalJson(manifest)),
			[BUNDLE_FILES.result]: utf8(canonicalJson(manifest.result))
		};
		const { files: forged, forger } = forgeBundle(edited);
		const report = verifyEvidence(forged, { trustedKeyIds: [forger.id] });
		expect(report.valid).toBe(false);
		expect(report.failedItem).toMatch(/^re-run: rungs\[\d+\]\./);
		const dir = unpack(forged);
		const own = spawnSync(process.execPath, ['verify.mjs', '--key-fingerprint', forger.id], {
			cwd: dir,
			encoding: 'utf8'
		});
		expect(own.status).toBe(1);
		expect(own.stdout).toMatch(/re-run: rungs/);
	});
});

describe('a referee re-runs a trials claim from a review link', () => {
	let referee: RefereeActor;

	beforeAll(async () => {
		const { database } = world;
		await shareClaim(database, asUser(author), claimId, {
			email: editorEmail,
			journal: 'Journal of Invented Optics',
			manuscript: 'JIO-2026-020'
		});
		const link = await createReviewLink(database, asUser(editor, 'editor'), claimId);
		const token = new URL(link.url).pathname.split('/').at(-1)!;
		const use = { method: 'GET', path: '/review' };
		referee = (await refereeFor(database, token, use, { address: '192.0.2.20' })) as RefereeActor;
	});

	it('gets the certified numbers to the bit, kept apart from the authors’ checks and never certified', async () => {
		const { database } = world;
		const started = await startRefereeCheck(database, referee, {});
		await idle();
		const rerun = await refereeCheck(database, referee, started.id);
		expect(rerun.status).toBe('done');
		expect(rerun.comparison).toEqual({
			sameSeed: true,
			identical: true,
			withinError: true,
			firstDifference: null,
			engines: null
		});
		// The review page's data: the certificate's kind, and the trials summed into two tables.
		const view = await refereeView(database, referee);
		expect(view.certificate.kind).toBe('time-ordered-trials');
		expect(view.tables.map((t) => t.basis)).toEqual([0, 1]);
		// The review page's list of re-runs, rendered as the server renders it (no bound to move).
		const { body } = render(ReRuns, {
			props: {
				recordedSeed: 1,
				certifiedLower: null,
				seedless: true,
				checks: [rerun],
				cancellable: [],
				form: null
			}
		});
		expect(body).toContain('Identical to the certificate, number for number.');
		expect(body).toMatch(/data-testid="rerun-schmidt">\d+</);
		// The whole review page renders (ResultSummary knows no trials result: it threw, a 500).
		const data = { ...view, cancellable: [], token: 'rvw_test' };
		const page = render(ReviewPage, { props: { data, form: null } as never }).body;
		expect(page).toContain('data-testid="rerun-list"');
		const listed = (await listChecks(database, asUser(author), claimId)).map((c) => c.id);
		expect(listed).not.toContain(started.id);
		await expect(
			issueCertificate(database, asUser(author), claimId, started.id)
		).rejects.toBeInstanceOf(ConflictError);
	});
});

describe('a trials certificate when the file was analysed more than once', () => {
	it('states the Bonferroni-corrected level (docs/statistics.md §8), re-run at it, and still verifies', async () => {
		const { database } = world;
		const other = await startCheck(database, asUser(author), claimId, { confidence: 0.999 });
		await idle();
		expect((await getCheck(database, asUser(author), other.id)).status).toBe('done');
		const check = await getCheck(database, asUser(author), checkId);
		const issued = await issueCertificate(database, asUser(author), claimId, checkId);
		const bundle = await readZip(
			(await certificateFile(database, asUser(author), issued.id, 'bundle')).bytes
		);
		const m = JSON.parse(decode(bundle[BUNDLE_FILES.manifest])) as TrialsManifest;
		// Bonferroni over the two distinct analyses: α/2 (Dunn, J. Am. Stat. Assoc. 56, 52 (1961), from memory).
		const corrected = 1 - (1 - check.confidence) / 2;
		expect(m.analyses?.total).toBe(2);
		expect(m.parameters.confidence).toBeCloseTo(corrected, 12);
		expect(m.result.confidence).toBe(m.parameters.confidence);
		expect(m.result.alpha).toBeCloseTo((1 - check.confidence) / 2, 12);
		const recorded = check.result as unknown as TrialsResult;
		expect(m.result.rungs.map((r) => r.log10P)).toEqual(recorded.rungs.map((r) => r.log10P));
		expect(verifyEvidence(bundle)).toMatchObject({ valid: true });
	});
});
