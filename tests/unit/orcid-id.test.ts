/**
 * ORCID iD check characters (ISO/IEC 7064:2003 MOD 11-2). Sources: ORCID's support article
 * "Structure of the ORCID Identifier" (example iDs 0000-0002-1825-0097, 0000-0001-5109-3700 and
 * 0000-0002-1694-233X, whose check character is X) and ORCID's "Calculating the ORCID Checksum"
 * worksheet (0000-0003-1415-9269: running total 1356, remainder 3, check digit 9).
 */
import { describe, expect, it } from 'vitest';
import { orcidCheckCharacter, orcidProblem, orcidUrl, parseOrcid } from '../../src/lib/orcid-id';

describe('the MOD 11-2 check character', () => {
	it.each([
		['000000021825009', '7'],
		['000000015109370', '0'],
		['000000021694233', 'X'],
		['000000031415926', '9']
	])('of %s is %s (ORCID’s published examples)', (digits, check) => {
		expect(orcidCheckCharacter(digits)).toBe(check);
	});
});

describe('parseOrcid', () => {
	it('accepts the published example in its usual forms and gives the hyphenated iD', () => {
		for (const text of [
			'0000-0002-1825-0097',
			'0000000218250097',
			' https://orcid.org/0000-0002-1825-0097 ',
			'0000-0002-1694-233x'
		])
			expect(parseOrcid(text)).toMatch(/^0000-0002-(1825-0097|1694-233X)$/);
	});

	it('refuses a wrong check character, a wrong shape and other hosts', () => {
		for (const text of [
			'0000-0002-1825-0098',
			'0000-0002-1694-2330',
			'0000-0002-1825-009',
			'0000-0002-1825-00977',
			'https://example.org/0000-0002-1825-0097',
			''
		])
			expect(parseOrcid(text)).toBeNull();
	});

	it('says why, in words for a form', () => {
		expect(orcidProblem('0000-0002-1825-0098')).toMatch(/wrong check character/);
		expect(orcidProblem('1234')).toMatch(/sixteen characters/);
		expect(orcidProblem('0000-0002-1825-0097')).toBeNull();
	});

	it('shows an iD as the https://orcid.org/ URL', () => {
		expect(orcidUrl('0000-0002-1825-0097')).toBe('https://orcid.org/0000-0002-1825-0097');
	});
});
