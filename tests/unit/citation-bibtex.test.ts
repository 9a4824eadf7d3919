/** BibTeX of a certificate whose words hold LaTeX's special characters, read back by an outside parser. */
import { toJSON } from '@orcid/bibtex-parse-js';
import { describe, expect, it } from 'vitest';
import { citationBibtex, citationRis } from '../../src/lib/server/certificates/citation';
import type { DoiSubject } from '../../src/lib/server/certificates/doi-subject';

const subject: DoiSubject = {
	doi: '10.99999/rankseal.0f1e2d3c',
	doiUrl: 'https://doi.org/10.99999/rankseal.0f1e2d3c',
	certificateId: '0f1e2d3c-0000-4000-8000-000000000000',
	claimTitle: 'Lake run #3: 50% {more} pairs & a_b ~ c^2 \\ done\nsecond line',
	dimension: 5,
	certifiedSchmidtNumber: 3,
	issuedAt: '2026-03-04T05:06:07.000Z',
	status: 'withdrawn',
	landingUrl: 'https://rankseal.test/seal/0f1e2d3c',
	manuscriptReference: null,
	supersedes: null,
	supersededBy: null,
	withdrawal: { reason: 'x', at: '2026-04-01T00:00:00.000Z' },
	creators: [
		{ name: 'Halvorsen, Ingrid', orcid: null },
		{ name: 'Sand and Stone Lab', orcid: null },
		{ name: 'Per Lund', orcid: '0000-0002-1825-0097' }
	],
	countsSha256: 'a'.repeat(64),
	fingerprint: 'b'.repeat(64),
	bundleSha256: 'c'.repeat(64),
	bundleName: 'rankseal-evidence-0f1e2d3c.zip'
};

describe('BibTeX with special characters', () => {
	const [entry, ...more] = toJSON(citationBibtex(subject));

	it('stays one entry whose braces balance, with every special character escaped', () => {
		expect(more).toEqual([]);
		const title = entry.entryTags.title;
		// LaTeX's ten special characters (Lamport, LaTeX: A Document Preparation System, 2nd ed., 1994; from memory).
		for (const escaped of ['\\#', '50\\%', '\\{more\\}', '\\&', 'a\\_b', '\\textasciitilde{}'])
			expect(title).toContain(escaped);
		expect(title).toContain('\\textasciicircum{}2 \\textbackslash{} done second line');
		expect(title).toContain('{$\\geq$} 3');
	});

	it('keeps a name with a comma or "and" whole, and says the certificate is withdrawn', () => {
		expect(entry.entryTags.author).toBe(
			'{Halvorsen, Ingrid} and {Sand and Stone Lab} and Per Lund'
		);
		expect(entry.entryTags.note).toMatch(/Withdrawn\.$/);
		expect(entry.entryTags.doi).toBe(subject.doi);
	});

	it('keeps RIS values on one line each', () => {
		const lines = citationRis(subject).split('\r\n');
		expect(lines.find((l) => l.startsWith('TI  - '))).toMatch(/done second line/);
	});
});
