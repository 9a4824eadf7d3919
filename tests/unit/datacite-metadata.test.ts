/**
 * The DataCite record built from a certificate: the manuscript reference as the schema's related
 * identifier types, ORCID iDs as name identifiers, and the whole record passing the fake
 * registry's kernel rules (DataCite Metadata Schema 4.6 mandatory properties and controlled lists).
 */
import { describe, expect, it } from 'vitest';
import {
	dataciteAttributes,
	manuscriptIdentifier
} from '../../src/lib/server/certificates/datacite-metadata';
import type { DoiSubject } from '../../src/lib/server/certificates/doi-subject';
import { recordErrors } from '../../src/lib/server/certificates/fake-registry-rules';

const subject: DoiSubject = {
	doi: '10.99999/rankseal.abc',
	doiUrl: 'https://doi.org/10.99999/rankseal.abc',
	certificateId: 'abc',
	claimTitle: 'Orbital angular momentum pairs',
	dimension: 7,
	certifiedSchmidtNumber: 4,
	issuedAt: '2026-05-06T07:08:09.000Z',
	status: 'superseded',
	landingUrl: 'https://rankseal.test/seal/abc',
	manuscriptReference: 'https://doi.org/10.1103/PhysRevLett.000.000000',
	supersedes: { id: 'old', doi: null, url: 'https://rankseal.test/seal/old' },
	supersededBy: { id: 'new', doi: '10.99999/rankseal.new', url: 'https://rankseal.test/seal/new' },
	withdrawal: null,
	// 0000-0002-1825-0097 is ORCID's own documented example iD (from memory).
	creators: [
		{ name: 'Ingrid Halvorsen', orcid: '0000-0002-1825-0097' },
		{ name: 'Per Lund', orcid: null }
	],
	countsSha256: 'a'.repeat(64),
	fingerprint: 'b'.repeat(64),
	bundleSha256: 'c'.repeat(64),
	bundleName: 'rankseal-evidence-abc.zip'
};

describe('the manuscript as a related identifier', () => {
	it('reads DOIs in their usual spellings, arXiv ids and URLs; leaves free text out', () => {
		const doi = { relatedIdentifier: '10.1364/OE.1.2', relatedIdentifierType: 'DOI' };
		for (const spelling of [
			'10.1364/OE.1.2',
			'doi:10.1364/OE.1.2',
			'https://doi.org/10.1364/OE.1.2'
		])
			expect(manuscriptIdentifier(spelling)).toMatchObject({
				...doi,
				relationType: 'IsSupplementTo'
			});
		expect(manuscriptIdentifier('arXiv:2601.00001v2')).toMatchObject({
			relatedIdentifier: 'arXiv:2601.00001v2',
			relatedIdentifierType: 'arXiv'
		});
		expect(manuscriptIdentifier('https://example.org/preprint/7')).toMatchObject({
			relatedIdentifierType: 'URL'
		});
		expect(manuscriptIdentifier('Submitted to a journal, 2026')).toBeNull();
		expect(manuscriptIdentifier(null)).toBeNull();
	});
});

describe('the DataCite record', () => {
	const attributes = dataciteAttributes(subject, true);

	it('names ORCID iDs as name identifiers and nobody else', () => {
		expect(attributes.creators[0].nameIdentifiers).toEqual([
			{
				nameIdentifier: 'https://orcid.org/0000-0002-1825-0097',
				nameIdentifierScheme: 'ORCID',
				schemeUri: 'https://orcid.org'
			}
		]);
		expect(attributes.creators[1].nameIdentifiers).toEqual([]);
	});

	it('links the manuscript, the older (by its page, having no DOI) and the newer version', () => {
		expect(
			attributes.relatedIdentifiers.map((r) => [r.relationType, r.relatedIdentifierType])
		).toEqual([
			['IsSupplementTo', 'DOI'],
			['IsNewVersionOf', 'URL'],
			['IsPreviousVersionOf', 'DOI']
		]);
		expect(attributes.event).toBe('publish');
		expect(dataciteAttributes(subject, false)).not.toHaveProperty('event');
	});

	it('passes the kernel rules, and fails them by name without a mandatory property', () => {
		expect(recordErrors(attributes)).toEqual([]);
		const { titles: _t, publisher: _p, ...rest } = attributes;
		expect(
			recordErrors(rest)
				.map((e) => e.source)
				.sort()
		).toEqual(['publisher', 'titles']);
		const badType = { ...attributes, types: { resourceTypeGeneral: 'Certificate' } };
		expect(recordErrors(badType).map((e) => e.source)).toEqual(['types.resourceTypeGeneral']);
	});
});
