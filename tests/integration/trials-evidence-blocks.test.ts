/**
 * Evidence of a time-ordered certificate in blocks mode from a plain (not compressed) file, made
 * by makeEvidence as the service makes it and checked by the same verifier a stranger runs; the
 * PDF read back with poppler. A row moved from one block into the next of the same basis leaves
 * the summed counts as they were and changes only the bets, so only the re-run can see it.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { certifyTrials, mulberry32, parseTrials } from '../../src/lib/certify/trials';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { BUNDLE_FILES } from '../../src/lib/evidence/layout';
import { evidenceTrials, type TrialsManifest } from '../../src/lib/evidence/trials-evidence';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { makeEvidence, type Evidence } from '../../src/lib/server/evidence/artifacts';
import { publishedKeys, serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { forgeBundle } from './forgery';

// Safety limits for bundling the verifier on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

const D = 4;
const utf8 = (text: string) => new TextEncoder().encode(text);
const decode = (bytes: Uint8Array) => new TextDecoder().decode(bytes);
let folder: string;
let rows: string[];
let evidence: Evidence;

/** 200 blocks of 12 rows, each block's basis drawn at random (π = 0.5, 0.5), visibility 0.9. */
function blocksCsv(): string[] {
	const random = mulberry32(20);
	const out = ['basis,outcome_a,outcome_b,block'];
	for (let block = 0; block < 200; block++) {
		const basis = random() < 0.5 ? 0 : 1;
		for (let i = 0; i < 12; i++) {
			const a = Math.floor(random() * D);
			const b = random() < 0.9 ? a : Math.floor(random() * D);
			out.push(`${basis},${a},${b},${block}`);
		}
	}
	return out;
}

beforeAll(async () => {
	folder = mkdtempSync(path.join(tmpdir(), 'rankseal-trials-blocks-'));
	process.env.RANKSEAL_DATA_DIR = folder;
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(folder, 'verify.mjs'));
	rows = blocksCsv();
	const uploaded = utf8(rows.join('\n') + '\n');
	const result = certifyTrials(parseTrials(uploaded, D, 'blocks'), {
		method: 'mub-correlation',
		bases: [0, 1],
		probabilities: [0.5, 0.5],
		confidence: 0.99,
		inputSha256: sha256Hex(uploaded)
	});
	const input = {
		certificateId: 'cert-blocks',
		issuedAt: '2026-12-05T07:00:00.000Z',
		claimId: 'claim-blocks',
		checkId: 'check-blocks',
		supersedes: null,
		claim: {
			title: 'Halvorsen Lake, block-wise settings',
			dimension: D,
			method: result.method,
			bases: result.bases,
			fourier: 'cyclic' as const,
			claimedSchmidtNumber: 3,
			manuscriptReference: null
		},
		parameters: { resamples: 10_000, confidence: 0.99, seed: 1, subtractAccidentals: false },
		result: JSON.parse(JSON.stringify(result)),
		trials: evidenceTrials('blocks', false),
		uploaded,
		uploadedFormat: 'csv' as const
	};
	const urls = { verify: 'https://rankseal.test/seal/x', keys: 'https://rankseal.test/keys' };
	evidence = await makeEvidence(input, serviceKey(), urls, { keys: publishedKeys() });
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('evidence of a blocks-mode trials certificate from a plain file', () => {
	it('carries the file as uploaded, the blocks condition, and verifies', () => {
		const m = evidence.manifest as unknown as TrialsManifest;
		expect(m.trials).toMatchObject({ mode: 'blocks', gzip: false });
		expect(m.trials.assumption).toMatch(/receives nothing from the detectors during a block/);
		expect(m.result.blocks).toBe(200);
		expect(decode(evidence.files['trials-uploaded.csv'])).toBe(rows.join('\n') + '\n');
		expect(evidence.files).not.toHaveProperty('counts-uploaded.csv');
		const readme = decode(evidence.files[BUNDLE_FILES.readme]).replace(/\s+/g, ' ');
		expect(readme).toContain('A certificate from time-ordered trials (a test supermartingale)');
		expect(readme).toContain('trials-uploaded.csv is the trials file exactly as uploaded');
		expect(readme).toMatch(/during a block/);
		// The file list names only what the folder holds: no counts file, no long-form CSV.
		expect(readme).toContain('trials-uploaded.csv the trials file exactly as it was uploaded');
		expect(readme).not.toContain('the counts file exactly as it was uploaded');
		expect(readme).not.toContain('counts-canonical.csv');
		expect(Object.keys(evidence.files)).not.toContain('counts-canonical.csv');
		expect(verifyEvidence(evidence.files)).toMatchObject({ valid: true, failedItem: null });
	});

	it('says its kind, the assumption and the blocks condition on the PDF', () => {
		const file = path.join(folder, 'blocks.pdf');
		writeFileSync(file, evidence.pdf);
		const text = execFileSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' })
			.replace(/\s+/g, ' ')
			.replace(/- /g, '-');
		expect(text).toMatch(/Certificate kind: time-ordered trials/);
		expect(text).toMatch(/one setting per block \(200 blocks\)/);
		expect(text).toMatch(/Blocks: one bet per block/);
		expect(text).toMatch(/the source receives nothing from the detectors during a block/);
	});

	it('refuses a row moved into the next block of the same basis (same sums, other bets)', () => {
		const basisOf = (k: number) => rows[k].split(',')[0];
		const blockOf = (k: number) => rows[k].split(',')[3];
		// The last row of a block whose next block has the same basis: give it the next block's id.
		const k = rows.findIndex(
			(_, j) =>
				j > 0 &&
				j + 1 < rows.length &&
				blockOf(j) !== blockOf(j + 1) &&
				basisOf(j) === basisOf(j + 1)
		);
		const moved = [...rows];
		const cells = moved[k].split(',');
		moved[k] = [...cells.slice(0, 3), blockOf(k + 1)].join(',');
		const tampered = utf8(moved.join('\n') + '\n');
		const m = evidence.manifest as unknown as TrialsManifest;
		const sha = sha256Hex(tampered);
		const manifest = {
			...m,
			counts: { ...m.counts, uploadedSha256: sha, uploadedBytes: tampered.byteLength },
			result: { ...m.result, inputSha256: sha, iid: { ...m.result.iid, inputSha256: sha } }
		};
		const { files, forger } = forgeBundle({
			...evidence.files,
			'trials-uploaded.csv': tampered,
			[BUNDLE_FILES.manifest]: utf8(canonicalJson(manifest)),
			[BUNDLE_FILES.result]: utf8(canonicalJson(manifest.result))
		});
		const report = verifyEvidence(files, { trustedKeyIds: [forger.id] });
		expect(report.valid).toBe(false);
		// Canonical counts passed: the sums are unchanged; the per-block bets are not.
		expect(report.passed).toContain(BUNDLE_FILES.canonicalCounts);
		expect(report.failedItem).toMatch(/^re-run: /);
	});
});
