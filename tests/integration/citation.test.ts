/**
 * Citation text of a certificate (BibTeX, RIS, plain text) and the data-availability sentence,
 * against a real SQLite file; the BibTeX is read back by an outside parser (@orcid/bibtex-parse-js).
 */
import { toJSON } from '@orcid/bibtex-parse-js';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { CITATION_TYPES } from '../../src/lib/server/certificates/citation';
import {
	certificateCitation,
	certificateCitations,
	citationFormat
} from '../../src/lib/server/certificates/citation-reads';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { FieldError, NotFoundError } from '../../src/lib/server/core/errors';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let cert: Awaited<ReturnType<typeof issueCertificate>>;

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-citation-test-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	const check = await finishedCheck(world, 31);
	cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

const cite = (format: 'bibtex' | 'ris' | 'text') =>
	certificateCitation(world.database, world.author, cert.id, format);

describe('citing a certificate', () => {
	it('gives BibTeX that an outside parser reads as one entry with the DOI', async () => {
		const entries = toJSON(await cite('bibtex'));
		expect(entries).toHaveLength(1);
		const [entry] = entries;
		expect(entry.entryType.toLowerCase()).toBe('misc');
		expect(entry.entryTags.doi).toBe(cert.doi!.doi);
		expect(entry.entryTags.author).toBe('Bo Strand and Ada Lind');
		expect(entry.entryTags.year).toBe(cert.issuedAt.slice(0, 4));
		expect(entry.entryTags.url).toBe(cert.doi!.url);
	});

	it('gives RIS opening with TY and closing with ER, CRLF line ends (the format as practised)', async () => {
		const ris = await cite('ris');
		const lines = ris.split('\r\n').filter(Boolean);
		expect(lines[0]).toBe('TY  - DATA');
		expect(lines.at(-1)).toBe('ER  - ');
		expect(lines).toContain(`DO  - ${cert.doi!.doi}`);
		expect(lines.filter((l) => l.startsWith('AU  - '))).toEqual([
			'AU  - Bo Strand',
			'AU  - Ada Lind'
		]);
		for (const line of lines) expect(line).toMatch(/^[A-Z][A-Z0-9]  - /);
	});

	it('gives plain text in the order Creator (Year). Title. Publisher. Type. DOI link', async () => {
		const text = (await cite('text')).trim();
		const year = cert.issuedAt.slice(0, 4);
		expect(text.startsWith(`Bo Strand, Ada Lind (${year}). `)).toBe(true);
		expect(text.endsWith(`. Rankseal. Dataset. ${cert.doi!.url}`)).toBe(true);
	});

	it('gives a data-availability sentence naming the DOI, the counts SHA-256 and the bundle', async () => {
		const all = await certificateCitations(world.database, world.author, cert.id);
		const dataset = (await world.database.models.Dataset.findByPk(world.datasetId))!;
		const row = (await world.database.models.Certificate.findByPk(cert.id))!;
		expect(all.dataAvailability).toContain(cert.doi!.doi);
		expect(all.dataAvailability).toContain(dataset.get('sha256') as string);
		expect(all.dataAvailability).toContain(`rankseal-evidence-${cert.id}.zip`);
		expect(all.dataAvailability).toContain(row.get('bundleSha256') as string);
	});

	it('follows the certificate JSON access rules and names `format` when it is not offered', async () => {
		await expect(
			certificateCitation(world.database, world.outsider, cert.id, 'text')
		).rejects.toBeInstanceOf(NotFoundError);
		expect(citationFormat(null)).toBe('text');
		expect(citationFormat('ris')).toBe('ris');
		expect(() => citationFormat('endnote')).toThrow(FieldError);
		expect(() => citationFormat('endnote')).toThrow(expect.objectContaining({ field: 'format' }));
		// Registered media types: RIS's as its vendors publish it, BibTeX's as common practice.
		expect(CITATION_TYPES.ris).toMatch(/^application\/x-research-info-systems/);
		expect(CITATION_TYPES.bibtex).toMatch(/^application\/x-bibtex/);
	});
});
