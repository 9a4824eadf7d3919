/**
 * The bundle's counts as long-form CSV (issue 18): counts-canonical.csv beside the canonical JSON,
 * named with its SHA-256 in the signed manifest, read back by an outside CSV reader (Python's csv
 * module) and by the offline verifier, which compares every cell with the uploaded counts.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { certify, parseCounts } from '../../src/lib/certify';
import { writeCountsSet } from '../../src/lib/certify/counts-set';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { BUNDLE_FILES, contentsText, type EvidenceFiles } from '../../src/lib/evidence/layout';
import type { EvidenceManifest } from '../../src/lib/evidence/manifest';
import { signText } from '../../src/lib/evidence/signing';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { makeEvidence, type Evidence } from '../../src/lib/server/evidence/artifacts';
import { publishedKeys, serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';

// Safety limits for bundling the verifier and Node child processes on a busy machine.
vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const CSV = 'counts-canonical.csv';
const utf8 = (text: string) => new TextEncoder().encode(text);
let scratch: string;
let verifier: string;

/** Three 3 × 3 grids, tab-separated, as a lab saves them; the cell values are the test's own. */
const grids = [0, 1, 2].map((t) =>
	Array.from({ length: 3 }, (_, a) =>
		Array.from({ length: 3 }, (_, b) => (a === b ? 900 + 10 * t + a : 30 + 3 * a + b + t))
	)
);
const gridFile = grids
	.map((g, t) => `# basis ${t}\n` + g.map((row) => row.join('\t')).join('\n'))
	.join('\n');

/** A JSON counts file whose basis 1 alone carries accidentals, declaring its Fourier convention. */
const jsonFile = JSON.stringify({
	dimension: 3,
	fourier: 'cyclic',
	tables: [
		{ basis: 0, counts: grids[0] },
		{ basis: 1, counts: grids[1], accidentals: grids[1].map((r) => r.map((c) => c / 1000)) },
		{ basis: 2, counts: grids[2] }
	]
});

async function evidenceOf(uploaded: Uint8Array, format: 'csv' | 'json'): Promise<Evidence> {
	const options = { method: 'mub-correlation', bases: [0, 1, 2], resamples: 1000, seed: 5 };
	const result = certify(parseCounts(uploaded, 3), {
		...options,
		fourier: 'cyclic',
		confidence: 0.99865,
		subtractAccidentals: false,
		claim: 2,
		inputSha256: sha256Hex(uploaded)
	});
	const claim = { title: 'Long form', dimension: 3, method: 'mub-correlation' as const };
	return makeEvidence(
		{
			certificateId: `cert-long-${format}`,
			issuedAt: '2026-12-05T07:00:00.000Z',
			claimId: 'claim-1',
			checkId: 'check-1',
			supersedes: null,
			claim: { ...claim, bases: [0, 1, 2], fourier: 'cyclic', claimedSchmidtNumber: 2 },
			parameters: { resamples: 1000, confidence: 0.99865, seed: 5, subtractAccidentals: false },
			result,
			uploaded,
			uploadedFormat: format
		} as Parameters<typeof makeEvidence>[0],
		serviceKey(),
		{ verify: 'https://rankseal.test/seal/x', keys: 'https://rankseal.test/api/v1/signing-keys' },
		{ keys: publishedKeys() }
	);
}

/** The bundle with its manifest changed and signed again by the service key (an insider). */
function resignedManifest(files: EvidenceFiles, manifest: EvidenceManifest): EvidenceFiles {
	const key = serviceKey();
	const text = canonicalJson(manifest);
	const out: EvidenceFiles = { ...files, [BUNDLE_FILES.manifest]: utf8(text) };
	out[BUNDLE_FILES.signature] = utf8(signText(text, key.secretKey) + '\n');
	delete out[BUNDLE_FILES.contents];
	delete out[BUNDLE_FILES.contentsSignature];
	const listed = contentsText(manifest.certificateId, sha256Hex(text), out);
	out[BUNDLE_FILES.contents] = utf8(listed);
	out[BUNDLE_FILES.contentsSignature] = utf8(signText(listed, key.secretKey) + '\n');
	return out;
}

/** The bundle's verify.mjs run with Node in a folder holding `files`. */
function runVerifier(files: EvidenceFiles) {
	const dir = mkdtempSync(path.join(scratch, 'bundle-'));
	for (const [name, bytes] of Object.entries(files)) writeFileSync(path.join(dir, name), bytes);
	const run = spawnSync(process.execPath, ['verify.mjs'], { cwd: dir, encoding: 'utf8' });
	return { status: run.status, out: run.stdout + run.stderr };
}

beforeAll(async () => {
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-long-form-'));
	process.env.RANKSEAL_DATA_DIR = scratch;
	process.env.ORIGIN = 'https://rankseal.test';
	verifier = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	process.env.RANKSEAL_VERIFIER = verifier;
});

describe('the long-form CSV in the evidence bundle', () => {
	it('is named with its SHA-256 in the signed manifest and holds one row per cell', async () => {
		const evidence = await evidenceOf(utf8(gridFile), 'csv');
		const bytes = evidence.files[CSV];
		expect(evidence.manifest.countsLongForm).toEqual({
			file: CSV,
			sha256: sha256Hex(bytes),
			bytes: bytes.byteLength
		});
		// An outside reader: Python's csv module (comment lines dropped), every row back to a grid.
		const script = [
			'import csv, json, sys',
			'rows = [r for r in csv.DictReader(l for l in sys.stdin if not l.startswith("#"))]',
			'out = {}',
			'for r in rows:',
			'  out.setdefault(r["basis"], [[None] * 3 for _ in range(3)])[int(r["outcome_a"])][int(r["outcome_b"])] = int(r["counts"])',
			'print(json.dumps([len(rows), out]))'
		].join('\n');
		const read = execFileSync('python3', ['-c', script], { input: bytes, encoding: 'utf8' });
		expect(JSON.parse(read)).toEqual([27, { '0': grids[0], '1': grids[1], '2': grids[2] }]);
		// The counts' identity is still the canonical JSON's hash.
		const json = evidence.files[BUNDLE_FILES.canonicalCounts];
		expect(evidence.manifest.counts.canonicalSha256).toBe(sha256Hex(json));
		// The README's file list names it, and the upload as a counts file.
		const readme = new TextDecoder().decode(evidence.files[BUNDLE_FILES.readme]);
		expect(readme).toMatch(/^ {2}counts-canonical\.csv {3}the same counts as long-form CSV/m);
		expect(readme).toMatch(/the counts file exactly as it was uploaded/);
		expect(readme).not.toContain('\u0000');
	});

	it('passes the offline verifier, which names it among the items checked', async () => {
		const evidence = await evidenceOf(utf8(gridFile), 'csv');
		expect(verifyEvidence(evidence.files).passed).toContain(CSV);
		const run = runVerifier(evidence.files);
		expect(run.out).toMatch(/every hash, both signatures and the re-run agree/);
		expect(run.status).toBe(3); // valid, the key vouched for by the bundle alone
	});

	it('keeps a table without accidentals at 0 beside one with them, and verifies', async () => {
		const evidence = await evidenceOf(utf8(jsonFile), 'json');
		const text = new TextDecoder().decode(evidence.files[CSV]);
		expect(text).toContain('basis,outcome_a,outcome_b,counts,accidentals\n');
		expect(text).toContain('\n0,0,0,900,0\n');
		expect(text).toContain('\n1,0,0,910,0.91\n');
		expect(text).toContain('# fourier: cyclic');
		expect(verifyEvidence(evidence.files)).toMatchObject({ valid: true });
	});

	it('a dataset of several files (a counts set): one long form of the joined counts, verified offline', async () => {
		const bare = (t: number) => grids[t].map((row) => row.join(';')).join('\n');
		const set = writeCountsSet(
			[0, 1, 2].map((t) => ({ name: `b${t}.csv`, bytes: utf8(bare(t)), basis: t }))
		);
		const evidence = await evidenceOf(set, 'csv');
		const single = await evidenceOf(utf8(gridFile), 'csv');
		expect(evidence.files[CSV]).toEqual(single.files[CSV]);
		expect(evidence.manifest.counts.canonicalSha256).toBe(single.manifest.counts.canonicalSha256);
		expect(evidence.manifest.counts.uploadedSha256).toBe(sha256Hex(set));
		const run = runVerifier(evidence.files);
		expect(run.out).toMatch(/every hash, both signatures and the re-run agree/);
		expect(run.status).toBe(3);
	});

	it('refuses a CSV whose cell differs from the upload, even under a re-signed manifest', async () => {
		const evidence = await evidenceOf(utf8(gridFile), 'csv');
		const changed = utf8(
			new TextDecoder().decode(evidence.files[CSV]).replace('\n1,2,0,37\n', '\n1,2,0,38\n')
		);
		const manifest = structuredClone(evidence.manifest);
		manifest.countsLongForm = { file: CSV, sha256: sha256Hex(changed), bytes: changed.byteLength };
		const files = resignedManifest({ ...evidence.files, [CSV]: changed }, manifest);
		expect(verifyEvidence(files)).toMatchObject({
			valid: false,
			failedItem: CSV,
			message: 'basis 1, outcome_a=2, outcome_b=0: counts 38, the upload has 37'
		});
		const run = runVerifier(files);
		expect(run.status).toBe(1);
		expect(run.out).toContain(CSV);
	});

	it('refuses a bundle that dropped the CSV the manifest names', async () => {
		const evidence = await evidenceOf(utf8(gridFile), 'csv');
		const files = { ...evidence.files };
		delete files[CSV];
		const listed = resignedManifest(files, evidence.manifest);
		expect(verifyEvidence(listed)).toMatchObject({ valid: false, failedItem: CSV });
	});
});
