/**
 * A linked ORCID iD shows where the person's work does: as their claim's author, on the
 * certificates of their claims (the certificate's JSON `authors[].orcid`, the public /seal record)
 * and in the PDF issued after linking (read back with poppler's pdftotext), always as the
 * https://orcid.org/ URL. An unlinked iD shows nowhere; orcidForAccount gives it to other services.
 * Example iD: ORCID's own, from its support article "Structure of the ORCID Identifier".
 */
import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { linkOrcid, orcidForAccount, unlinkOrcid } from '../../src/lib/server/accounts/orcid-links';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import {
	certificateFile,
	getCertificate,
	lookupCertificate
} from '../../src/lib/server/certificates/certificate-reads';
import { getClaim } from '../../src/lib/server/claims/claims';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

const CARBERRY = '0000-0002-1825-0097';
let world: EvidenceWorld;
let certificateId: string;
let pdfText: string;

beforeAll(async () => {
	world = await evidenceWorld();
	await linkOrcid(world.database, world.author, CARBERRY);
	const check = await finishedCheck(world, 5);
	const issued = await issueCertificate(world.database, world.lead, world.claimId, check.id);
	certificateId = issued.id;
	const pdf = (await certificateFile(world.database, world.author, issued.id, 'pdf')).bytes;
	const file = path.join(world.ctx.folder, 'orcid.pdf');
	writeFileSync(file, pdf);
	pdfText = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
});
afterAll(async () => world?.ctx.close());

describe('a linked iD', () => {
	it('is given by orcidForAccount, and null for an account without one', async () => {
		expect(await orcidForAccount(world.database, world.author.userId)).toBe(CARBERRY);
		expect(await orcidForAccount(world.database, world.lead.userId)).toBeNull();
	});

	it('shows as the claim author’s iD', async () => {
		const claim = await getClaim(world.database, world.lead, world.claimId);
		expect(claim.createdBy).toMatchObject({ name: 'Bo Strand', orcid: CARBERRY });
	});

	it('is in the certificate’s JSON and the public /seal record, with each author', async () => {
		const certificate = await getCertificate(world.database, world.lead, certificateId);
		expect(certificate.authors).toContainEqual({ name: 'Bo Strand', orcid: CARBERRY });
		expect(certificate.authors).toContainEqual({ name: 'Ada Lind', orcid: null });
		expect(certificate.authors[0].name).toBe('Bo Strand');
		const lookup = await lookupCertificate(world.database, certificateId);
		expect(lookup.status === 'unknown' ? [] : lookup.authors).toContainEqual({
			name: 'Bo Strand',
			orcid: CARBERRY
		});
	});

	it('is printed in the PDF as the https://orcid.org/ URL', () => {
		const oneLine = pdfText.replace(/\s+/g, ' ');
		expect(oneLine).toContain(`ORCID iDs: Bo Strand https://orcid.org/${CARBERRY}`);
	});

	it('no longer shows once unlinked', async () => {
		await unlinkOrcid(world.database, world.author);
		const claim = await getClaim(world.database, world.lead, world.claimId);
		expect(claim.createdBy.orcid).toBeNull();
		const certificate = await getCertificate(world.database, world.lead, certificateId);
		expect(certificate.authors.every((a) => a.orcid === null)).toBe(true);
	});
});
