/**
 * λ fitted on a separate calibration run in the service (witnesses.md §4.3′, §9), on a real SQLite
 * file (migration 0025) with the bundled check worker: the claim waits for its run, the run is
 * fitted and frozen, a run that is the certified counts is refused at upload and at check time,
 * and the certificate carries the run, which the offline verifier re-fits (a tampered run fails).
 * Expected numbers: the engine called directly (tests/unit/target-fit.test.ts ties the fit to
 * §4.3′'s p₀(m, m) = λ_m² and its coverage).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCounts } from '../../src/lib/certify';
import { certifyTarget, fitCaution, fitTarget } from '../../src/lib/certify/fidelity-target';
import type { TargetResult } from '../../src/lib/certify/fidelity-target';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { BUNDLE_FILES } from '../../src/lib/evidence/layout';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { archiveFilterSchema } from '../../src/lib/archive/schema';
import { groupArchive } from '../../src/lib/server/claims/archive';
import { createClaim, getClaim, listClaims } from '../../src/lib/server/claims/claims';
import { addTargetRun } from '../../src/lib/server/claims/target-run';
import { updateClaim } from '../../src/lib/server/claims/claim-edit';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { problemOf } from '../../src/lib/server/http/problems';
import { makeEvidence } from '../../src/lib/server/evidence/artifacts';
import { publishedKeys, serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { TARGET_EXAMPLE, targetCountsCsv } from '../target-counts';
import { addGroup, addUser, bytesOf, claimFields } from './backend-fixtures';
import { asUser } from './actors';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let folder: string;
let ada: string;

const { d, raw, v } = TARGET_EXAMPLE;
const counts = targetCountsCsv(raw, v, 1e6);
/** The calibration run: the computational table (basis 0) of the same source, a shorter run. */
const runCsv = (pairs: number) =>
	targetCountsCsv(raw, v, pairs)
		.split('\n')
		.filter((row) => !row.startsWith('1,'))
		.join('\n');
const run = runCsv(2e5);

const runClaim = (extra: Record<string, unknown> = {}) =>
	createClaim(ctx.database, asUser(ada), {
		...claimFields,
		dimension: d,
		method: 'fidelity-target',
		claimedSchmidtNumber: 2,
		targetFrom: 'calibration-run',
		...extra
	} as Parameters<typeof createClaim>[2]);

const upload = (claimId: string, text: string, name = 'calibration-run.csv') =>
	addTargetRun(ctx.database, asUser(ada), claimId, { bytes: bytesOf(text), originalName: name });

async function refusal(run: () => Promise<unknown>) {
	try {
		await run();
	} catch (error) {
		return problemOf(error);
	}
	throw new Error('expected a refusal');
}

async function finished(id: string) {
	await (await startCheckRunner(ctx.database)).idle();
	return (await getCheck(ctx.database, asUser(ada), id))!;
}

beforeAll(async () => {
	ctx = await temporaryDatabase();
	folder = mkdtempSync(path.join(tmpdir(), 'rankseal-target-run-'));
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.RANKSEAL_CHECK_WORKERS = '1';
	process.env.ORIGIN = 'https://rankseal.test';
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(path.join(folder, 'worker.mjs'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(folder, 'verify.mjs'));
	const lake = await addGroup(ctx.database, 'Halvorsen Lake Photonics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
	rmSync(folder, { recursive: true, force: true });
});

describe('a fidelity-target claim with λ from a calibration run', () => {
	it('waits for its run: no λ, no check; λ with a run is refused by name', async () => {
		const claim = await runClaim();
		expect(claim.targetFrom).toBe('calibration-run');
		expect(claim.target).toBeNull();
		expect(claim.targetRun).toBeNull();
		await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(counts),
			originalName: 'pixels.csv'
		});
		expect(await refusal(() => startCheck(ctx.database, asUser(ada), claim.id, {}))).toMatchObject({
			status: 400,
			field: 'targetRun',
			message: expect.stringMatching(/Upload the calibration run first/)
		});
		await expect(runClaim({ target: raw })).rejects.toThrow(/not both/);
		const declared = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: d,
			method: 'fidelity-target',
			claimedSchmidtNumber: 2,
			target: raw
		} as Parameters<typeof createClaim>[2]);
		expect(await refusal(() => upload(declared.id, run))).toMatchObject({
			status: 400,
			field: 'targetRun',
			message: expect.stringMatching(/declares its target/)
		});
	});

	it('fits λ on the run, freezes it with the run’s SHA-256, and takes no second run', async () => {
		const claim = await runClaim();
		const view = await upload(claim.id, run, 'run-0412.csv');
		const fit = fitTarget(parseCounts(bytesOf(run), d), sha256Hex(bytesOf(run)));
		expect(view.target).toEqual({ coefficients: fit.coefficients, declared: null });
		expect(view.targetRun).toEqual({
			sha256: sha256Hex(bytesOf(run)),
			name: 'run-0412.csv',
			diagonal: fit.diagonal
		});
		// Read back from SQLite: the run's bytes as uploaded.
		const row = (await ctx.database.models.Claim.findByPk(claim.id))!.get({ plain: true });
		expect(new TextDecoder().decode(row.targetRun!)).toBe(run);
		expect(await refusal(() => upload(claim.id, runCsv(3e5)))).toMatchObject({
			status: 409,
			message: expect.stringMatching(/λ is frozen/)
		});
		// The edit form (text fields only) keeps where λ came from and λ itself; d is held to λ.
		const edit = { ...claimFields, dimension: '3', method: 'fidelity-target', bases: '0,1' };
		const edited = await updateClaim(ctx.database, asUser(ada), claim.id, {
			...edit,
			title: 'Pixel pairs, renamed',
			fourier: 'cyclic',
			claimedSchmidtNumber: '2',
			manuscriptReference: ''
		} as never);
		expect(edited).toMatchObject({ title: 'Pixel pairs, renamed', targetFrom: 'calibration-run' });
		expect(edited.target).toEqual(view.target);
		const wider = { ...edit, dimension: '4', claimedSchmidtNumber: '2', fourier: 'cyclic' };
		expect(
			await refusal(() => updateClaim(ctx.database, asUser(ada), claim.id, wider as never))
		).toMatchObject({ field: 'dimension', message: expect.stringMatching(/d = 3/) });
	});

	it('refuses a run that is the certified counts, and counts that are the run, naming them', async () => {
		const first = await runClaim();
		await addDataset(ctx.database, asUser(ada), first.id, {
			bytes: bytesOf(counts),
			originalName: 'pixels.csv'
		});
		expect(await refusal(() => upload(first.id, counts))).toMatchObject({
			status: 400,
			field: 'targetRun',
			message: expect.stringMatching(/very counts being certified.*pixels\.csv/)
		});
		expect((await getClaim(ctx.database, asUser(ada), first.id)).target).toBeNull();
		// The same computational table in other bytes is the same counts (§9).
		const second = await runClaim();
		await upload(second.id, run);
		const sameTable = run.replace(
			'basis,outcome_a,outcome_b,counts',
			'# same\nbasis,outcome_a,outcome_b,counts'
		);
		await expect(
			addDataset(ctx.database, asUser(ada), second.id, {
				bytes: bytesOf(
					sameTable +
						counts
							.split('\n')
							.filter((r) => r.startsWith('1,'))
							.join('\n')
				),
				originalName: 'reused.csv'
			})
		).rejects.toThrow(/very counts being certified/);
		expect(await ctx.database.models.Dataset.count({ where: { claimId: second.id } })).toBe(0);
	});

	it('refuses at check time a run that equals the counts (one slipped past two uploads at once)', async () => {
		const claim = await runClaim();
		await upload(claim.id, run);
		const dataset = await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(counts),
			originalName: 'pixels.csv'
		});
		// As if the run had been stored while the counts were being read: the same bytes.
		const row = await ctx.database.models.Claim.findByPk(claim.id);
		await row!.update({ targetRun: Buffer.from(counts), targetRunSha256: dataset.sha256 });
		const check = await finished((await startCheck(ctx.database, asUser(ada), claim.id, {})).id);
		expect(check.status).toBe('failed');
		expect(check.error).toMatch(/very counts being certified/);
	});

	it('runs the check with the frozen λ, says where it came from, and certifies with the run in the bundle', async () => {
		const claim = await runClaim();
		await upload(claim.id, run, 'run-0412.csv');
		const dataset = await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(counts),
			originalName: 'pixels.csv'
		});
		const check = await finished((await startCheck(ctx.database, asUser(ada), claim.id, {})).id);
		expect(check.status).toBe('done');
		const result = check.result as unknown as TargetResult;
		const fit = fitTarget(parseCounts(bytesOf(run), d), sha256Hex(bytesOf(run)));
		const direct = certifyTarget(parseCounts(bytesOf(counts), d), {
			target: fit.coefficients,
			confidence: check.confidence,
			claim: 2,
			inputSha256: dataset.sha256
		});
		expect(result.statistic).toEqual(JSON.parse(JSON.stringify(direct.statistic)));
		expect(result.targetFit).toEqual(fit);
		expect(result.warnings[0]).toBe(fitCaution(fit));

		const cert = await issueCertificate(ctx.database, asUser(ada), claim.id, check.id);
		const files = readZip(
			(await certificateFile(ctx.database, asUser(ada), cert.id, 'bundle')).bytes
		);
		const manifest = JSON.parse(new TextDecoder().decode(files[BUNDLE_FILES.manifest]));
		expect(manifest.target).toEqual({
			coefficients: fit.coefficients,
			declared: null,
			source: 'calibration-run',
			run: { file: 'calibration-run.csv', sha256: fit.runSha256, bytes: bytesOf(run).byteLength },
			fit: { method: 'diagonal-share', diagonal: fit.diagonal }
		});
		expect(new TextDecoder().decode(files['calibration-run.csv'])).toBe(run);
		expect(new TextDecoder().decode(files[BUNDLE_FILES.readme])).toMatch(
			/calibration-run\.csv: the separate calibration run the target λ was fitted on/
		);
		// The RO-Crate names the run as an input of the check.
		const crate = JSON.parse(new TextDecoder().decode(files[BUNDLE_FILES.crate]));
		const action = crate['@graph'].find((e: { '@type': string }) => e['@type'] === 'CreateAction');
		expect(action.object).toContainEqual({ '@id': 'calibration-run.csv' });
		const report = verifyEvidence(files);
		expect(report).toMatchObject({ valid: true, failedItem: null });
		expect(report.passed).toContain('calibration-run.csv (λ re-fitted)');
		// The bundle's own verify.mjs in the unzipped folder (exit 3: passed, key not anchored).
		const unzipped = mkdtempSync(path.join(folder, 'bundle-'));
		for (const [name, bytes] of Object.entries(files))
			writeFileSync(path.join(unzipped, name), bytes);
		const offline = spawnSync(process.execPath, ['verify.mjs'], {
			cwd: unzipped,
			encoding: 'utf8'
		});
		expect(offline.stdout + offline.stderr).not.toMatch(/FAIL/);
		expect(offline.status).toBe(3);
		// The certificate says where λ came from (read back with poppler's pdftotext).
		writeFileSync(path.join(folder, 'certificate.pdf'), files[BUNDLE_FILES.pdf]);
		const pdf = execFileSync(
			'pdftotext',
			['-enc', 'UTF-8', path.join(folder, 'certificate.pdf'), '-'],
			{
				encoding: 'utf8'
			}
		).replace(/\s+/g, ' ');
		expect(pdf).toMatch(
			/fitted on a separate calibration run \(calibration-run\.csv in the bundle/
		);
		expect(pdf).not.toMatch(/declared with the claim before the data/);

		// A tampered run, signed anew by the service's own key: it no longer fits the certified λ.
		const tampered = run.replace(/^0,1,1,(\d+)$/m, (_, n) => `0,1,1,${Number(n) - 500}`);
		expect(tampered).not.toBe(run);
		const forged = await forge(manifest, files, bytesOf(tampered));
		expect(verifyEvidence(forged)).toMatchObject({
			valid: false,
			failedItem: 'calibration-run.csv',
			message: expect.stringMatching(/not the certified λ/)
		});
		// The certified counts given as their own run: refused by name.
		const own = await forge(manifest, files, files['counts-uploaded.csv']);
		expect(verifyEvidence(own)).toMatchObject({
			valid: false,
			failedItem: 'calibration-run.csv',
			message: expect.stringMatching(/very counts being certified/)
		});
	});
});

/** The manifest re-made with another run file (its hash and size recorded truly) and re-signed. */
async function forge(
	manifest: Record<string, never>,
	files: Record<string, Uint8Array>,
	runBytes: Uint8Array
) {
	const target = manifest.target as Record<string, unknown>;
	const forgedTarget = {
		...target,
		run: { file: 'calibration-run.csv', sha256: sha256Hex(runBytes), bytes: runBytes.byteLength }
	};
	const evidence = await makeEvidence(
		{
			...(manifest as object),
			target: forgedTarget,
			targetRunBytes: runBytes,
			uploaded: files['counts-uploaded.csv'],
			uploadedFormat: 'csv'
		} as never,
		serviceKey(),
		{ verify: 'https://rankseal.test/seal/x', keys: 'https://rankseal.test/api/v1/signing-keys' },
		{ keys: publishedKeys() }
	);
	return evidence.files;
}

describe('lists of claims with calibration runs', () => {
	it('never read the runs’ bytes: the claim list and the archive', async () => {
		for (let i = 0; i < 2; i++) await upload((await runClaim()).id, runCsv(2e5 + i));
		// Every Claim row any query returns, as Sequelize built it: the lists must leave the blob out.
		const withRun: string[] = [];
		const seen = (rows: unknown) => {
			for (const row of [rows].flat() as { dataValues?: Record<string, unknown> }[])
				if (row?.dataValues && 'targetRun' in row.dataValues)
					withRun.push(String(row.dataValues.id));
		};
		ctx.database.models.Claim.addHook('afterFind', 'watch-runs', seen);
		try {
			const page = await listClaims(ctx.database, asUser(ada), { pageSize: 100 });
			expect(page.items.filter((c) => c.targetRun !== null).length).toBeGreaterThanOrEqual(2);
			const archive = await groupArchive(ctx.database, asUser(ada), archiveFilterSchema.parse({}));
			expect(archive.claims.length).toBeGreaterThanOrEqual(2);
			expect(withRun).toEqual([]);
			// The control: one claim read whole, as a check reads it, does carry the run.
			await ctx.database.models.Claim.findByPk(page.items[0].id);
			expect(withRun).toHaveLength(1);
		} finally {
			ctx.database.models.Claim.removeHook('afterFind', 'watch-runs');
		}
	});
});
