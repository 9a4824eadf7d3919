/**
 * fidelity-target claims end to end (witnesses.md §4.3′): a real SQLite file (migration 0020 keeps
 * λ), the counts read and the check run on the bundled check worker. Expected numbers: the engine
 * called directly (tests/unit/fidelity-target.test.ts ties it to §4.3′'s isotropic example).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCounts } from '../../src/lib/certify';
import { certifyTarget, type TargetResult } from '../../src/lib/certify/fidelity-target';
import { startCheckRunner } from '../../src/lib/server/checks/registry';
import { TARGET_CAUTION } from '../../src/lib/server/checks/target-task';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { createClaim, getClaim } from '../../src/lib/server/claims/claims';
import { updateClaim } from '../../src/lib/server/claims/claim-edit';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { TARGET_EXAMPLE, targetCountsCsv } from '../target-counts';
import { BUNDLE_FILES } from '../../src/lib/evidence/layout';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { makeEvidence } from '../../src/lib/server/evidence/artifacts';
import { publishedKeys, serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { addGroup, addUser, bytesOf, claimFields } from './backend-fixtures';
import { asUser } from './actors';
import { workerDatabase, type WorkerDatabase } from './worker-database';

let ctx: WorkerDatabase;
let workerFolder: string;
let ada: string;

const { d, raw, v } = TARGET_EXAMPLE;
const csv = targetCountsCsv(raw, v, 1e6);
const unit = raw.map((x) => x / Math.hypot(...raw));

const targetClaim = (target: unknown) =>
	createClaim(ctx.database, asUser(ada), {
		...claimFields,
		dimension: d,
		method: 'fidelity-target',
		claimedSchmidtNumber: 2,
		target
	} as Parameters<typeof createClaim>[2]);

function pdfText(pdf: Uint8Array): string {
	const file = path.join(workerFolder, 'certificate.pdf');
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' });
}

async function finished(id: string) {
	await (await startCheckRunner(ctx.database)).idle();
	return (await getCheck(ctx.database, asUser(ada), id))!;
}

beforeAll(async () => {
	ctx = await workerDatabase();
	process.env.ORIGIN = 'https://rankseal.test';
	workerFolder = ctx.workerFolder;
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(workerFolder, 'verify.mjs'));
	const lake = await addGroup(ctx.database, 'Halvorsen Lake Photonics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
});
afterAll(async () => {
	await ctx.close();
});

describe('fidelity-target claims on the service', () => {
	it('stores the declared λ (as declared when we scaled it) and reads it back from SQLite', async () => {
		const claim = await targetClaim(raw);
		const stored = await getClaim(ctx.database, asUser(ada), claim.id);
		expect(stored.method).toBe('fidelity-target');
		expect(stored.bases).toEqual([0, 1]);
		stored.target!.coefficients.forEach((x, i) => expect(x).toBeCloseTo(unit[i], 12));
		expect(stored.target!.declared).toEqual(raw);
		expect((await targetClaim(unit)).target).toEqual({ coefficients: unit, declared: null });
		await expect(targetClaim([0.1, 0.5, 0.5])).rejects.toThrow(/must not increase/);
		// An edit keeps the declared target and is checked against it (d must match λ).
		await expect(
			updateClaim(ctx.database, asUser(ada), claim.id, {
				...claimFields,
				method: 'fidelity-target',
				dimension: 4,
				claimedSchmidtNumber: 2
			})
		).rejects.toThrow(/Give 4 Schmidt coefficients/);
		// The edit form sends text fields only: the target is kept and the title changes.
		const edited = await updateClaim(ctx.database, asUser(ada), claim.id, {
			title: 'Pixel pairs, renamed',
			sourceDescription: 'simulated',
			dimension: '3',
			method: 'fidelity-target',
			bases: '0,1',
			fourier: 'cyclic',
			claimedSchmidtNumber: '2',
			manuscriptReference: ''
		});
		expect(edited.title).toBe('Pixel pairs, renamed');
		expect(edited.target).toEqual(stored.target);
	});

	it('runs the check on the worker: F̃, its exact lower bound, the ladder Σλ², the caution', async () => {
		const claim = await targetClaim(raw);
		const dataset = await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(csv),
			originalName: 'pixels-target.csv'
		});
		const check = await finished((await startCheck(ctx.database, asUser(ada), claim.id, {})).id);
		expect(check.status).toBe('done');
		const result = check.result as unknown as TargetResult;
		const direct = certifyTarget(parseCounts(bytesOf(csv), d), {
			target: unit,
			confidence: check.confidence,
			claim: 2,
			inputSha256: dataset.sha256
		});
		expect(result.statistic).toEqual(JSON.parse(JSON.stringify(direct.statistic)));
		// §4.3′'s isotropic example: F̃ = 0.8893355 (rounded counts: within 1e-4).
		expect(result.statistic.value).toBeCloseTo(TARGET_EXAMPLE.value, 4);
		// Ladder B_r = Σ_{i≤r} λ_i² (Bavaresco et al., Nat. Phys. 14, 1032 (2018)).
		expect(result.bounds.map((b) => b.bound)).toEqual(
			[unit[0] ** 2, unit[0] ** 2 + unit[1] ** 2].map((x) => expect.closeTo(x, 12))
		);
		expect(result.certifiedSchmidtNumber).toBe(2);
		expect(result.claim).toEqual({ schmidtNumber: 2, verdict: 'supported' });
		expect(result.warnings[0]).toBe(TARGET_CAUTION);
		expect(result.warnings[1]).toMatch(/scaled it to Σλ² = 1/);
		expect((await getClaim(ctx.database, asUser(ada), claim.id)).latestCheck).toMatchObject({
			status: 'done',
			certifiedSchmidtNumber: 2
		});
	});

	it('issues a certificate that carries λ, states its assumption, and re-runs offline', async () => {
		const claim = await targetClaim(raw);
		await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(csv),
			originalName: 'pixels-target.csv'
		});
		const check = await finished((await startCheck(ctx.database, asUser(ada), claim.id, {})).id);
		// Issuing runs verify.mjs's checks on the pool first: it succeeds only if the re-run agrees.
		const cert = await issueCertificate(ctx.database, asUser(ada), claim.id, check.id);
		const files = readZip(
			(await certificateFile(ctx.database, asUser(ada), cert.id, 'bundle')).bytes
		);
		const manifest = JSON.parse(new TextDecoder().decode(files[BUNDLE_FILES.manifest]));
		expect(manifest.claim.method).toBe('fidelity-target');
		const near = unit.map((x) => expect.closeTo(x, 12));
		expect(manifest.target).toEqual({ coefficients: near, declared: raw, source: 'declared' });
		expect(manifest.result.target).toEqual(near);
		expect(manifest.result.certifiedSchmidtNumber).toBe(2);
		expect(verifyEvidence(files)).toMatchObject({ valid: true, failedItem: null });
		// The bundle's own verify.mjs, run by a stranger's Node in the unzipped folder.
		const folder = mkdtempSync(path.join(workerFolder, 'bundle-'));
		for (const [name, bytes] of Object.entries(files))
			writeFileSync(path.join(folder, name), bytes);
		const offline = spawnSync(process.execPath, ['verify.mjs'], { cwd: folder, encoding: 'utf8' });
		// Exit 3: every check passed, the key not anchored to a list given on the command line.
		expect(offline.stdout + offline.stderr).not.toMatch(/FAIL/);
		expect(offline.status).toBe(3);
		const text = pdfText(files[BUNDLE_FILES.pdf]);
		expect(text).toMatch(/declared with the claim before the data were seen/);
		expect(text).toMatch(/0\.863/);
		// Another λ, signed by the service's own key, does not re-run to the recorded result.
		const other = {
			...manifest.target,
			coefficients: [0.8, 0.5, 0.33].map((x, _, a) => x / Math.hypot(...a))
		};
		const forged = await makeEvidence(
			{ ...manifest, target: other, uploaded: files['counts-uploaded.csv'], uploadedFormat: 'csv' },
			serviceKey(),
			{ verify: 'https://rankseal.test/seal/x', keys: 'https://rankseal.test/api/v1/signing-keys' },
			{ keys: publishedKeys() }
		);
		expect(verifyEvidence(forged.files)).toMatchObject({
			valid: false,
			failedItem: expect.stringMatching(/^re-run/)
		});
	});

	it('fails the check plainly when the tilted table (basis 1) is missing', async () => {
		const claim = await targetClaim(unit);
		const only0 = csv
			.split('\n')
			.filter((row) => !row.startsWith('1,'))
			.join('\n');
		await expect(
			addDataset(ctx.database, asUser(ada), claim.id, {
				bytes: bytesOf(only0),
				originalName: 'computational-only.csv'
			})
		).rejects.toThrow(/basis 1/);
	});
});

describe('re-running a fidelity-target check from its result', () => {
	it('gives a command line that the CLI parses to the same target and confidence', async () => {
		const { targetCommand } = await import('../../src/lib/evidence/target-command');
		const result = certifyTarget(parseCounts(bytesOf(csv), d), { target: raw, claim: 2 });
		const line = targetCommand(result, "run's counts.csv");
		expect(line).toContain(`--target ${result.target.join(',')}`);
		expect(line).toContain(`--confidence ${result.confidence} --claim 2`);
		expect(line).toContain(`--counts 'run'\\''s counts.csv'`);
	});
});
