/**
 * A certificate from a dataset of several files (issue 18), issued by the service on a real
 * SQLite file: the bundle carries the counts set as uploaded, its canonical counts in JSON and as
 * long-form CSV, and the verifier passes it, reading the set's files back.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { splitCountsSet } from '../../src/lib/certify/counts-set';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { BUNDLE_FILES } from '../../src/lib/evidence/layout';
import { canonicalCountsText } from '../../src/lib/evidence/manifest';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { addCountsFiles } from '../../src/lib/server/datasets/counts-files';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for issuing (PDF, zip, self-check on the work pool) on a busy machine.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

const d = 5;
const counts = sampledCounts(states.isotropic(d, 0.93), [0, 1, 2], 40_000, 29);
const grid = (t: number) =>
	Array.from({ length: d }, (_, a) =>
		[...counts.tables[t].counts.subarray(a * d, a * d + d)].join('\t')
	).join('\n') + '\n';
let world: EvidenceWorld;

beforeAll(async () => {
	world = await evidenceWorld();
});
afterAll(async () => world.ctx.close());

describe('a certificate from three grid files', () => {
	it('bundles the set, verifies, and its long-form CSV holds the joined counts', async () => {
		const files = [0, 1, 2].map((t) => ({
			name: `run7-basis${t}.tsv`,
			bytes: new TextEncoder().encode(grid(t)),
			basis: t
		}));
		const dataset = await addCountsFiles(world.database, world.author, world.claimId, { files });
		const check = await finishedCheck(world, 9, 400, {
			claimId: world.claimId,
			datasetId: dataset.id
		});
		const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
		const zip = (await certificateFile(world.database, world.author, cert.id, 'bundle')).bytes;
		const bundle = readZip(zip);
		const uploaded = bundle['counts-uploaded.csv'];
		expect(sha256Hex(uploaded)).toBe(dataset.sha256);
		splitCountsSet(uploaded).forEach((f, i) =>
			expect(sha256Hex(f.bytes)).toBe(sha256Hex(files[i].bytes))
		);
		const canonical = canonicalCountsText(parseCounts(toCountsCsv(counts), d));
		expect(new TextDecoder().decode(bundle[BUNDLE_FILES.canonicalCounts])).toBe(canonical);
		const report = verifyEvidence(bundle);
		expect(report.message).toBe('every hash, both signatures and the re-run agree');
		expect(report.passed).toContain(BUNDLE_FILES.canonicalCountsCsv);
	});
});
