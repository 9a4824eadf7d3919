/**
 * The evidence bundle against both verifiers: the bundle's own verify.mjs run with Node in the
 * unzipped folder, and `npm run verify` (src/cli/verify.ts) on the zip. Tampering of every kind
 * must be refused, naming the first failed item.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { BUNDLE_FILES, contentsText, type EvidenceFiles } from '../../src/lib/evidence/layout';
import type { EvidenceManifest, WitnessManifest } from '../../src/lib/evidence/manifest';
import { newSigningKey, signText } from '../../src/lib/evidence/signing';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { makeEvidence } from '../../src/lib/server/evidence/artifacts';
import { publishedKeys, rotateServiceKey, serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { readZip, ZipError } from '../../src/lib/server/evidence/zip-read';
import { zipFiles } from '../../src/lib/server/evidence/zip-write';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for bundling, issuing and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let zip: Buffer;
let files: EvidenceFiles;
let folder: string;

const utf8 = (text: string) => new TextEncoder().encode(text);
const decode = (bytes: Uint8Array) => new TextDecoder().decode(bytes);

/** The bundle's own verifier, run with Node in `dir` (default: the unzipped bundle). */
function runBundled(dir = folder, args: string[] = []) {
	const run = spawnSync(process.execPath, ['verify.mjs', ...args], { cwd: dir, encoding: 'utf8' });
	return { status: run.status, out: run.stdout + run.stderr };
}

/** `npm run --silent verify -- BUNDLE.zip` (the script it runs: the launcher and bundle). */
function runCli(zipFile: string, args: string[] = []) {
	const run = spawnSync(process.execPath, ['scripts/cli.mjs', 'verify', zipFile, ...args], {
		encoding: 'utf8'
	});
	return { status: run.status, out: run.stdout + run.stderr };
}

/** Writes files into a fresh folder and returns it. */
function unpack(contents: EvidenceFiles): string {
	const dir = mkdtempSync(path.join(scratch, 'bundle-'));
	for (const [name, bytes] of Object.entries(contents)) writeFileSync(path.join(dir, name), bytes);
	return dir;
}

// mulberry32 (common practice): a small seeded generator, so the tampering is the same every run.
function mulberry32(seed: number) {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-bundle-test-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	const check = await finishedCheck(world, 21);
	const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
	zip = (await certificateFile(world.database, world.author, cert.id, 'bundle')).bytes;
	writeFileSync(path.join(scratch, 'bundle.zip'), zip);
	// Unzipped by an independent reader (Python's zipfile), as a stranger would.
	folder = path.join(scratch, 'unzipped');
	execFileSync('python3', ['-m', 'zipfile', '-e', path.join(scratch, 'bundle.zip'), folder]);
	folder = path.join(folder, `rankseal-${cert.id}`);
	files = readZip(zip);
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

describe('a genuine bundle', () => {
	it('holds the files the issue names, the same bytes through both zip readers', () => {
		expect(Object.keys(files).sort()).toEqual(
			[...Object.values(BUNDLE_FILES), 'counts-uploaded.csv'].sort()
		);
		for (const [name, bytes] of Object.entries(files))
			expect(Buffer.compare(readFileSync(path.join(folder, name)), Buffer.from(bytes))).toBe(0);
		expect(() => readZip(Buffer.from('not a zip at all'))).toThrow(ZipError);
		expect(() => readZip(zip.subarray(0, zip.length - 30))).toThrow(ZipError);
	});

	it('passes verify.mjs in the unzipped folder and npm run verify on the zip, with the same report', () => {
		const keys = path.join(scratch, 'published.json');
		writeFileSync(keys, JSON.stringify({ keys: publishedKeys() }));
		const bundled = runBundled(folder, ['--keys', keys]);
		const cli = runCli(path.join(scratch, 'bundle.zip'), ['--keys', keys]);
		expect(bundled.status).toBe(0);
		expect(bundled.out).toMatch(/^PASS: every hash, both signatures and the re-run agree/m);
		expect(cli).toEqual(bundled);
	});

	it('needs nothing but Node built-ins: verify.mjs imports no package and no network module', () => {
		const source = decode(files[BUNDLE_FILES.verifier]);
		const imported = [...source.matchAll(/(?:from|import)\s*\(?\s*["']([^"']+)["']/g)].map(
			(m) => m[1]
		);
		// node:zlib inflates gzip-compressed trials files (time-ordered certificates, issue 20).
		expect(new Set(imported)).toEqual(
			new Set(['node:fs', 'node:path', 'node:url', 'node:util', 'node:module', 'node:zlib'])
		);
		expect(source).not.toMatch(/node:(http|https|net|dns|tls|dgram)\b/);
	});
});

describe('tampering', () => {
	it('catches 100 seeded single-byte changes spread over every file, in both verifiers', async () => {
		const names = Object.keys(files).sort();
		const random = mulberry32(8785);
		const zips: string[] = [];
		for (let i = 0; i < 100; i++) {
			const name = names[i % names.length];
			const changed = Uint8Array.from(files[name]);
			const at = Math.floor(random() * changed.length);
			changed[at] ^= 1 + Math.floor(random() * 255);
			const tampered = { ...files, [name]: changed };
			const where = `${name} byte ${at}`;
			zips.push(path.join(scratch, `tampered-${i}.zip`));
			writeFileSync(zips[i], await zipFiles(tampered, new Date(0), 'bundle'));
			writeFileSync(path.join(folder, name), changed);
			try {
				const bundled = runBundled();
				expect(bundled.status, where).toBe(1);
				// A change inside verify.mjs may stop it before it reports; any other is named.
				if (name !== BUNDLE_FILES.verifier) expect(bundled.out, where).toMatch(/^FAIL at /m);
			} finally {
				writeFileSync(path.join(folder, name), files[name]);
			}
		}
		// The npm command on all 100 zips in one run: one FAIL report for each.
		const cli = runCli(zips[0], zips.slice(1));
		expect(cli.status).toBe(1);
		const reports = cli.out.split(/^== /m).slice(1);
		expect(reports).toHaveLength(100);
		reports.forEach((report, i) => expect(report, zips[i]).toMatch(/^FAIL at /m));
		expect(cli.out).not.toMatch(/^PASS/m);
	});

	it('gives the same report and status from npm run verify as from verify.mjs', async () => {
		const zipPath = path.join(scratch, 'tampered.zip');
		for (const name of [BUNDLE_FILES.manifest, 'counts-uploaded.csv', BUNDLE_FILES.pdf]) {
			const changed = Uint8Array.from(files[name]);
			changed[Math.floor(changed.length / 2)] ^= 0x20;
			writeFileSync(zipPath, await zipFiles({ ...files, [name]: changed }, new Date(0), 'b'));
			const bundled = runBundled(unpack({ ...files, [name]: changed }));
			expect(bundled.out).toContain(
				`FAIL at ${name}: its SHA-256 differs from the signed file list`
			);
			expect(runCli(zipPath)).toEqual(bundled);
		}
	});

	it('refuses a manifest re-signed with another key, with or without its public key swapped in', () => {
		const forger = newSigningKey();
		const manifest = JSON.parse(decode(files[BUNDLE_FILES.manifest])) as EvidenceManifest;
		const forged = canonicalJson({
			...manifest,
			claim: { ...manifest.claim, claimedSchmidtNumber: 5 },
			signingKeyId: forger.id
		});
		const swapped: EvidenceFiles = {
			...files,
			[BUNDLE_FILES.manifest]: utf8(forged),
			[BUNDLE_FILES.signature]: utf8(signText(forged, forger.secretKey) + '\n'),
			[BUNDLE_FILES.publicKey]: utf8(forger.publicKey + '\n')
		};
		const {
			[BUNDLE_FILES.contents]: _c,
			[BUNDLE_FILES.contentsSignature]: _s,
			...listed
		} = swapped;
		const list = contentsText(manifest.certificateId, sha256Of(forged), listed);
		swapped[BUNDLE_FILES.contents] = utf8(list);
		swapped[BUNDLE_FILES.contentsSignature] = utf8(signText(list, forger.secretKey) + '\n');
		const report = verifyEvidence(swapped);
		expect(report).toMatchObject({ valid: false, failedItem: 'signing key' });
		const dir = unpack(swapped);
		expect(runBundled(dir)).toMatchObject({
			status: 1,
			out: expect.stringContaining('FAIL at signing key: key')
		});
		// Only the manifest and its signature replaced: the genuine public key does not verify them.
		const resigned = {
			...files,
			[BUNDLE_FILES.manifest]: utf8(forged),
			[BUNDLE_FILES.signature]: swapped[BUNDLE_FILES.signature]
		};
		expect(verifyEvidence(resigned).failedItem).toBe(BUNDLE_FILES.manifest);
		expect(verifyEvidence(resigned).message).toMatch(/SHA-256 differs/);
	});

	it('refuses a correctly signed manifest whose recorded result differs from the re-run', async () => {
		const manifest = JSON.parse(decode(files[BUNDLE_FILES.manifest])) as WitnessManifest;
		const { result } = manifest;
		const shifted = {
			...result,
			statistic: { ...result.statistic, lower: result.statistic.lower + 1e-9 }
		};
		const evidence = await makeEvidence(
			{
				...manifest,
				result: shifted,
				uploaded: files['counts-uploaded.csv'],
				uploadedFormat: 'csv'
			},
			serviceKey(),
			{ verify: 'https://rankseal.test/seal/x', keys: 'https://rankseal.test/api/v1/signing-keys' },
			{ keys: publishedKeys() }
		);
		expect(verifyEvidence(evidence.files)).toMatchObject({
			valid: false,
			failedItem: 're-run: statistic.lower'
		});
		const dir = unpack(evidence.files);
		expect(runBundled(dir)).toMatchObject({
			status: 1,
			out: expect.stringContaining('FAIL at re-run: statistic.lower')
		});
	});
});

describe('keys', () => {
	it('keeps earlier certificates valid after rotation, and --keys refuses a key not on the given list', async () => {
		const before = serviceKey();
		const rotated = rotateServiceKey();
		expect(rotated.id).not.toBe(before.id);
		const keys = publishedKeys();
		expect(keys.map((k) => [k.id, k.retiredAt === null])).toEqual([
			[before.id, false],
			[rotated.id, true]
		]);
		writeFileSync(path.join(scratch, 'keys.json'), JSON.stringify({ keys }));
		writeFileSync(path.join(scratch, 'other.json'), JSON.stringify({ keys: [{ id: rotated.id }] }));
		expect(runBundled(folder, ['--keys', path.join(scratch, 'keys.json')]).status).toBe(0);
		const refused = runBundled(folder, ['--keys', path.join(scratch, 'other.json')]);
		expect(refused).toMatchObject({
			status: 1,
			out: expect.stringContaining('FAIL at signing key')
		});
		const next = await issueCertificate(
			world.database,
			world.author,
			world.claimId,
			(await finishedCheck(world, 22)).id
		);
		expect(next.keyId).toBe(rotated.id);
		// issue, the rotated key's introduction (signed with the key before it), issue, supersede.
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true, entries: 4 });
	});
});

const sha256Of = (text: string) => createHash('sha256').update(text).digest('hex');
