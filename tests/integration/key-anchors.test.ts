/**
 * Issue 15 part 4: a bundle whose signing key only the bundle itself vouches for never gets a bare
 * PASS. A forger who re-signs a bundle with their own key, listed in the bundle's own
 * signing-keys.json, gets NOT ANCHORED (exit 3) from both verify.mjs and `npm run verify`; PASS
 * (exit 0) needs --keys FILE or --key-fingerprint HEX naming the key, and the service's own list
 * (/seal) refuses the forger outright.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { EvidenceFiles } from '../../src/lib/evidence/layout';
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
