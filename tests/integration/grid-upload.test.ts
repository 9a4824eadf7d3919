/**
 * A grid counts file end to end (issue 18): stored byte for byte with the SHA-256 of what was
 * uploaded, its layout described, and a certificate from it whose bundle holds the uploaded bytes
 * and verifies (issuing runs the stranger's verifier first).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseCounts, sampledCounts, states } from '../../src/lib/certify';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
beforeAll(async () => {
	world = await evidenceWorld();
});
afterAll(async () => world.ctx.close());

const d = 5;
function gridText(): string {
	const data = sampledCounts(states.isotropic(d, 0.9), [0, 1, 2], 30_000, 19);
	const lines = ['# Halvorsen Lake run 4 (simulated), exported from the lab sheet'];
	for (const t of data.tables) {
		lines.push(`# basis ${t.basis}`);
		for (let a = 0; a < d; a++) lines.push([...t.counts.subarray(a * d, a * d + d)].join('\t'));
	}
	return lines.join('\r\n') + '\r\n';
}

describe('a grid upload', () => {
	it('keeps the bytes and their SHA-256, says how it was read, and certifies', async () => {
		const bytes = new TextEncoder().encode(gridText());
		const dataset = await addDataset(world.database, world.author, world.claimId, {
			bytes,
			originalName: 'run4-grids.tsv'
		});
		expect(dataset.sha256).toBe(sha256Hex(bytes));
		expect(readFileSync(datasetFilePath(dataset.sha256))).toEqual(Buffer.from(bytes));
		expect(dataset.summary.readAs).toBe('read as 3 grids of 5 × 5, tab-separated');
		const check = await finishedCheck(world, 13, 400, {
			claimId: world.claimId,
			datasetId: dataset.id
		});
		const cert = await issueCertificate(world.database, world.lead, world.claimId, check.id);
		const zip = await certificateFile(world.database, world.author, cert.id, 'bundle');
		const files = readZip(zip.bytes);
		expect(Buffer.from(files['counts-uploaded.csv'])).toEqual(Buffer.from(bytes));
		expect(verifyEvidence(files).valid).toBe(true);
		expect(parseCounts(bytes, d).tables.map((t) => t.basis)).toEqual([0, 1, 2]);
	});
});
