/**
 * A calibrated check's evidence (witnesses.md §4.4): the calibration file is hashed into the
 * manifest, carried in the bundle like the counts, and the verifier re-runs with it; a bundle whose
 * calibration was swapped or dropped is refused naming calibration.json.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { render } from 'svelte/server';
import { certify, ENGINE_VERSION, parseCounts } from '../../src/lib/certify';
import { parseCalibration } from '../../src/lib/certify/calibration';
import { sha256Hex } from '../../src/lib/evidence/hash';
import {
	BUNDLE_FILES,
	CALIBRATION_FILE,
	contentsText,
	type EvidenceFiles
} from '../../src/lib/evidence/layout';
import type { WitnessManifest } from '../../src/lib/evidence/manifest';
import { signText } from '../../src/lib/evidence/signing';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { makeEvidence, type Evidence } from '../../src/lib/server/evidence/artifacts';
import { publishedKeys, serviceKey } from '../../src/lib/server/evidence/keys';
import { compareRuns } from '../../src/lib/server/review/referee';
import type { CheckView } from '../../src/lib/server/checks/checks';
import type { RefereeCheck } from '../../src/lib/views/checks';
import ReRuns from '../../src/routes/review/[token]/ReRuns.svelte';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const counts = readFileSync('tests/fixtures/calibrated-d3-product.csv');
const calibrationBytes = readFileSync('tests/fixtures/calibrated-d3-bases.json');
let evidence: Evidence;
let plain: Evidence;
/** The plain certificate's result: a witness family's (the manifest also types fidelity-target). */
const plainResult = () => (plain.manifest as WitnessManifest).result;

/** The PDF's text as poppler's pdftotext reads it. */
function pdfText(pdf: Uint8Array): string {
	const file = path.join(mkdtempSync(path.join(tmpdir(), 'rankseal-cal-pdf-')), 'c.pdf');
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' });
}

beforeAll(async () => {
	process.env.RANKSEAL_DATA_DIR = mkdtempSync(path.join(tmpdir(), 'rankseal-cal-evidence-'));
	process.env.ORIGIN = 'https://rankseal.test';
	const options = {
		method: 'mub-correlation',
		bases: [0, 1, 2],
		fourier: 'cyclic' as const,
		resamples: 1000,
		confidence: 0.99865,
		seed: 3,
		subtractAccidentals: false,
		claim: 2,
		inputSha256: sha256Hex(counts),
		calibration: parseCalibration(calibrationBytes, 3),
		calibrationSha256: sha256Hex(calibrationBytes)
	};
	const result = certify(parseCounts(counts, 3), options);
	const input = (r: typeof result, calibrated: boolean) => ({
		certificateId: 'cert-calibrated',
		issuedAt: '2026-12-05T04:00:00.000Z',
		claimId: 'claim-1',
		checkId: 'check-1',
		supersedes: null,
		claim: {
			title: 'Three nearly unbiased bases, d = 3',
			dimension: 3,
			method: 'mub-correlation' as const,
			bases: [0, 1, 2],
			fourier: 'cyclic' as const,
			claimedSchmidtNumber: 2,
			manuscriptReference: null
		},
		parameters: { resamples: 1000, confidence: 0.99865, seed: 3, subtractAccidentals: false },
		result: r,
		uploaded: counts,
		uploadedFormat: 'csv' as const,
		calibrationBytes: calibrated ? calibrationBytes : null
	});
	const urls = {
		verify: 'https://rankseal.test/seal/x',
		keys: 'https://rankseal.test/api/v1/signing-keys'
	};
	evidence = await makeEvidence(input(result, true), serviceKey(), urls, { keys: publishedKeys() });
	const { calibration: _c, calibrationSha256: _s, ...uncalibrated } = options;
	const plainResult = certify(parseCounts(counts, 3), uncalibrated);
	plain = await makeEvidence(input(plainResult, false), serviceKey(), urls, {
		keys: publishedKeys()
	});
});

/** The bundle with `files` changed and its file list signed again by the service key (an insider). */
function resigned(files: EvidenceFiles): EvidenceFiles {
	const out = { ...files };
	delete out[BUNDLE_FILES.contents];
	delete out[BUNDLE_FILES.contentsSignature];
	const listed = contentsText(evidence.manifest.certificateId, evidence.fingerprint, out);
	out[BUNDLE_FILES.contents] = new TextEncoder().encode(listed);
	out[BUNDLE_FILES.contentsSignature] = new TextEncoder().encode(
		signText(listed, serviceKey().secretKey) + '\n'
	);
	return out;
}

describe('evidence of a calibrated check', () => {
	it('names the calibration in the manifest, carries it, and verifies by re-running with it', () => {
		expect(evidence.manifest.calibration).toEqual({
			uploadedSha256: sha256Hex(calibrationBytes),
			uploadedBytes: calibrationBytes.byteLength
		});
		expect(evidence.manifest.result.certifiedSchmidtNumber).toBe(1);
		expect(sha256Hex(evidence.files[CALIBRATION_FILE])).toBe(sha256Hex(calibrationBytes));
		const report = verifyEvidence(evidence.files);
		expect(report.message).toBe('every hash, both signatures and the re-run agree');
		expect(report.passed).toContain('calibration.json (manifest hash)');
	});

	it('refuses a bundle whose calibration was swapped or dropped, even with a re-signed file list', () => {
		const other = JSON.parse(calibrationBytes.toString());
		other.tolerance = 0.001;
		const swapped = resigned({
			...evidence.files,
			[CALIBRATION_FILE]: new TextEncoder().encode(JSON.stringify(other))
		});
		expect(verifyEvidence(swapped)).toMatchObject({
			valid: false,
			failedItem: 'calibration.json'
		});
		const dropped = { ...evidence.files };
		delete dropped[CALIBRATION_FILE];
		expect(verifyEvidence(resigned(dropped))).toMatchObject({
			valid: false,
			failedItem: 'calibration.json'
		});
	});

	it('the PDF says which bases the certificate holds for, in one line', () => {
		expect(pdfText(evidence.pdf)).toMatch(
			/Calibrated bases: the ladder uses the measured overlaps \(mu\+ = 1\.02361/
		);
		const text = pdfText(plain.pdf).replace(/\s+/g, ' ');
		expect(plainResult().certifiedSchmidtNumber).toBe(2);
		const tolerance = plainResult().calibrationTolerance!.value!;
		expect(text).toContain(`Holds for bases unbiased to within ${(100 * tolerance).toFixed(2)} %`);
		expect(verifyEvidence(plain.files).valid).toBe(true);
	});

	it('a result recorded before these fields existed (same engine version) still verifies', async () => {
		const { calibration: _c, calibrationTolerance: _t, ...older } = plainResult();
		const evidenceOfOlder = await makeEvidence(
			{
				...plain.manifest,
				certificateId: 'cert-older',
				result: older as ReturnType<typeof plainResult>,
				uploaded: counts,
				uploadedFormat: 'csv'
			},
			serviceKey(),
			{ verify: 'https://rankseal.test/seal/y', keys: 'https://rankseal.test/api/v1/signing-keys' },
			{ keys: publishedKeys() }
		);
		expect(evidenceOfOlder.manifest.result).not.toHaveProperty('calibrationTolerance');
		expect(verifyEvidence(evidenceOfOlder.files).valid).toBe(true);
	});

	it('a referee re-run of such an older result is still identical; a real difference still shows', () => {
		const { calibration: _c, calibrationTolerance: _t, ...older } = plainResult();
		const view = (result: object) => ({ seed: 3, result }) as unknown as CheckView;
		expect(compareRuns(view(older), view(plainResult()))).toMatchObject({
			identical: true,
			firstDifference: null
		});
		const shifted = { ...plainResult(), certifiedSchmidtNumber: 3 };
		expect(compareRuns(view(older), view(shifted)).firstDifference).toBe('certifiedSchmidtNumber');
	});

	it('a re-run by a newer engine than the certificate’s is said so, not "should not happen"', () => {
		const view = (result: object) => ({ seed: 3, result }) as unknown as CheckView;
		const now = plainResult();
		const before = { ...now, engine: { ...now.engine, version: '3.1.0' } };
		const comparison = compareRuns(view(before), view(now));
		expect(comparison).toMatchObject({
			identical: false,
			firstDifference: 'engine.version',
			engines: { certified: '3.1.0', rerun: ENGINE_VERSION }
		});
		expect(compareRuns(view(now), view(now)).engines).toBeNull();
		const rerun = { ...view(now), id: 'r1', status: 'done', comparison } as unknown as RefereeCheck;
		const props = { recordedSeed: 3, certifiedLower: now.statistic.lower, seedless: false };
		const { body } = render(ReRuns, {
			props: { ...props, checks: [rerun], cancellable: [], form: null }
		});
		const words = body.replace(/<!--[^]*?-->/g, '').replace(/\s+/g, ' ');
		expect(words).toContain(
			`The certificate was computed by engine 3.1.0 and this re-run by engine ${ENGINE_VERSION}`
		);
		expect(words).not.toContain('this should not happen');
	});
});
