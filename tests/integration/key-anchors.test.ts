/**
 * Issue 15 part 4: a bundle whose signing key only the bundle itself vouches for never gets a bare
 * PASS. A forger who re-signs a bundle with their own key, listed in the bundle's own
 * signing-keys.json, gets NOT ANCHORED (exit 3) from both verify.mjs and `npm run verify`; PASS
 * (exit 0) needs --keys FILE or --key-fingerprint HEX naming the key, and the service's own list
 * (/seal) refuses the forger outright. A genuine bundle of an older engine version is intact but
 * not re-run by this engine: NOT RE-RUN (exit 4), and /seal says why.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { ENGINE_VERSION } from '../../src/lib/certify';
import type { EvidenceFiles } from '../../src/lib/evidence/layout';
import type { EvidenceManifest } from '../../src/lib/evidence/manifest';
import type { CheckAttributes } from '../../src/lib/server/db/models/Check';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { publishedKeys, serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { zipFiles } from '../../src/lib/server/evidence/zip-write';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { certificateFile, checkBundle } from '../../src/lib/server/certificates/certificate-reads';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';
import { forgeBundle } from './forgery';

// Safety limits for issuing, bundling and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let genuine: EvidenceFiles;
let forged: EvidenceFiles;
let forgerId: string;
let keysFile: string;

function unpack(files: EvidenceFiles): string {
	const dir = mkdtempSync(path.join(scratch, 'bundle-'));
	for (const [name, bytes] of Object.entries(files)) writeFileSync(path.join(dir, name), bytes);
	return dir;
}

/** The bundle's own verify.mjs, run with Node in the unzipped folder. */
function bundled(files: EvidenceFiles, args: string[] = []) {
	const run = spawnSync(process.execPath, ['verify.mjs', ...args], {
		cwd: unpack(files),
		encoding: 'utf8'
	});
	return { status: run.status, out: run.stdout + run.stderr };
}

/** `npm run --silent verify -- BUNDLE.zip` (the launcher and its bundle). */
async function cli(files: EvidenceFiles, args: string[] = []) {
	const zip = path.join(mkdtempSync(path.join(scratch, 'zip-')), 'bundle.zip');
	writeFileSync(zip, await zipFiles(files, new Date(0), 'bundle'));
	const run = spawnSync(process.execPath, ['scripts/cli.mjs', 'verify', zip, ...args], {
		encoding: 'utf8'
	});
	return { status: run.status, out: run.stdout + run.stderr };
}

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-anchors-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	const check = await finishedCheck(world, 41);
	const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
	genuine = readZip((await certificateFile(world.database, world.author, cert.id, 'bundle')).bytes);
	const forgery = forgeBundle(genuine);
	forged = forgery.files;
	forgerId = forgery.forger.id;
	keysFile = path.join(scratch, 'keys.json');
	writeFileSync(keysFile, JSON.stringify({ keys: publishedKeys() }));
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

describe('a bundle re-signed with a key only it vouches for', () => {
	it('is internally consistent: every hash and signature agree with its own list', () => {
		expect(verifyEvidence(forged)).toMatchObject({ valid: true, anchored: false, keyId: forgerId });
	});

	it('gets NOT ANCHORED and exit 3 from verify.mjs and from npm run verify, never PASS', async () => {
		for (const run of [bundled(forged), await cli(forged)]) {
			expect(run.status, run.out).toBe(3);
			expect(run.out).not.toMatch(/^PASS/m);
			expect(run.out).toMatch(/^NOT ANCHORED: signature valid/m);
			expect(run.out).toContain(`only the bundle itself vouches for signing key ${forgerId}`);
			expect(run.out).toContain('https://rankseal.test/api/v1/signing-keys');
		}
	});

	it('fails (exit 1) against the service’s saved key list or the genuine key’s fingerprint', async () => {
		const pins = [
			['--keys', keysFile],
			['--key-fingerprint', serviceKey().id]
		];
		for (const args of pins)
			for (const run of [bundled(forged, args), await cli(forged, args)]) {
				expect(run.status, run.out).toBe(1);
				expect(run.out).toMatch(/^FAIL at signing key: key [0-9a-f]{64} is not among/m);
			}
	});

	it('is refused by /seal, which checks against the keys this service published', async () => {
		const { report } = await checkBundle(world.database, await zipFiles(forged, new Date(0), 'b'));
		expect(report).toMatchObject({ valid: false, failedItem: 'signing key' });
	});
});

describe('the genuine bundle', () => {
	it('is NOT ANCHORED (exit 3) without a pin, PASS (exit 0) with --keys or --key-fingerprint', async () => {
		expect(bundled(genuine)).toMatchObject({ status: 3 });
		expect(await cli(genuine)).toMatchObject({ status: 3 });
		// The fingerprint as a person might copy it from a page: upper case, in groups of four.
		const grouped = serviceKey()
			.id.toUpperCase()
			.replace(/(.{4})(?!$)/g, '$1 ');
		for (const args of [
			['--keys', keysFile],
			['--key-fingerprint', grouped]
		]) {
			const folder = bundled(genuine, args);
			expect(folder.status, folder.out).toBe(0);
			expect(folder.out).toMatch(/^PASS: every hash, both signatures and the re-run agree/m);
			expect(await cli(genuine, args)).toEqual(folder);
		}
	});

	it('answers a malformed pin or both pins at once as a usage mistake (exit 2)', async () => {
		for (const args of [
			['--key-fingerprint', 'abc123'],
			['--keys', keysFile, '--key-fingerprint', serviceKey().id],
			['--keys', path.join(scratch, 'no-such-file.json')]
		]) {
			expect(bundled(genuine, args).status, args.join(' ')).toBe(2);
			expect((await cli(genuine, args)).status, args.join(' ')).toBe(2);
		}
	});
});

describe('a genuine bundle made by another engine version', () => {
	// What a bundle issued before an engine change looks like: the service's own key over a manifest
	// and result that name the older engine (the numbers are the ones that engine signed).
	const older = (m: EvidenceManifest): EvidenceManifest => ({
		...m,
		engineVersion: '3.1.0',
		result: {
			...m.result,
			engine: { ...m.result.engine, version: '3.1.0' }
		} as EvidenceManifest['result']
	});
	let made: EvidenceFiles;
	beforeAll(() => {
		expect(ENGINE_VERSION).not.toBe('3.1.0');
		made = forgeBundle(genuine, serviceKey(), older).files;
	});

	it('is intact but not re-run: NOT RE-RUN (exit 4) from npm run verify, with the reason', async () => {
		const report = verifyEvidence(made, { trustedKeyIds: [serviceKey().id] });
		expect(report).toMatchObject({ valid: true, anchored: true, otherEngine: '3.1.0' });
		expect(report.passed).not.toContain('re-run');
		expect(report.message).toContain(
			`made by engine 3.1.0 and this verifier has engine ${ENGINE_VERSION}`
		);
		const run = await cli(made, ['--keys', keysFile]);
		expect(run.status, run.out).toBe(4);
		expect(run.out).toMatch(/^NOT RE-RUN: signature valid; every hash and both signatures agree/m);
		// With several bundles the worst status wins: a missing anchor outweighs a re-run left undone.
		const zips = [made, forged].map((files, i) => {
			const zip = path.join(mkdtempSync(path.join(scratch, `two-${i}-`)), 'bundle.zip');
			return { zip, files };
		});
		for (const { zip, files } of zips) writeFileSync(zip, await zipFiles(files, new Date(0), 'b'));
		const both = spawnSync(
			process.execPath,
			['scripts/cli.mjs', 'verify', ...zips.map((z) => z.zip)],
			{
				encoding: 'utf8'
			}
		);
		expect(both.status, both.stdout).toBe(3);
	});

	it('is intact on /seal, which says it was not re-run there and why', async () => {
		const { report } = await checkBundle(world.database, await zipFiles(made, new Date(0), 'b'));
		expect(report).toMatchObject({ valid: true, otherEngine: '3.1.0' });
		expect(report.message).toMatch(/the bundle's own verify\.mjs, which has engine 3\.1\.0/);
	});

	it('fails when its result names another engine than its manifest', () => {
		const split = forgeBundle(genuine, serviceKey(), (m) => ({ ...m, engineVersion: '3.1.0' }));
		expect(verifyEvidence(split.files, { trustedKeyIds: [serviceKey().id] })).toMatchObject({
			valid: false,
			failedItem: 'engine version'
		});
	});
});

describe('a check run by another engine version', () => {
	it('is not certified: its bundle could not re-run under its own verify.mjs', async () => {
		const check = await finishedCheck(world, 47);
		const { Check } = world.database.models;
		const row = (await Check.findByPk(check.id))!;
		const result = row.get('result') as NonNullable<CheckAttributes['result']>;
		await row.update({ result: { ...result, engine: { ...result.engine, version: '3.1.0' } } });
		await expect(
			issueCertificate(world.database, world.author, world.claimId, check.id)
		).rejects.toThrow(
			`This check was run by engine 3.1.0, and this service has engine ${ENGINE_VERSION}; run the check again to certify it`
		);
	});
});
