/**
 * The claim schema takes its limits from src/lib/claims/claim-limits.ts, the one place the claim
 * form reads them too: each limit holds exactly at its value and refuses one past it, naming the
 * field. (A refactor of literals: the values are the ones the schema had.)
 */
import { describe, expect, it } from 'vitest';
import {
	MANUSCRIPT_REFERENCE_MAX_LENGTH,
	MAX_DIMENSION,
	MIN_DIMENSION,
	SOURCE_DESCRIPTION_MAX_LENGTH,
	TITLE_MAX_LENGTH
} from '../../src/lib/claims/claim-limits';
import { claimInputSchema } from '../../src/lib/claims/schema';

const claim = {
	title: 'Time-bin pairs',
	sourceDescription: 'Simulated isotropic source',
	dimension: '5',
	method: 'mub-correlation',
	bases: '0,1',
	claimedSchmidtNumber: '2'
};

/** The fields a parse refuses (none: accepted). */
const refused = (patch: Record<string, string>) => {
	const parsed = claimInputSchema.safeParse({ ...claim, ...patch });
	return parsed.success ? [] : parsed.error.issues.map((i) => String(i.path[0]));
};

describe('claim limits from one place', () => {
	it.each([
		['title', TITLE_MAX_LENGTH],
		['sourceDescription', SOURCE_DESCRIPTION_MAX_LENGTH],
		['manuscriptReference', MANUSCRIPT_REFERENCE_MAX_LENGTH]
	])('%s takes %i characters and refuses one more', (field, limit) => {
		expect(refused({ [field]: 'x'.repeat(limit) })).toEqual([]);
		expect(refused({ [field]: 'x'.repeat(limit + 1) })).toEqual([field]);
	});

	it('takes the dimension from MIN_DIMENSION to MAX_DIMENSION', () => {
		expect(refused({ dimension: String(MIN_DIMENSION), claimedSchmidtNumber: '1' })).toEqual([]);
		expect(refused({ dimension: String(MIN_DIMENSION - 1), claimedSchmidtNumber: '1' })).toContain(
			'dimension'
		);
		expect(refused({ dimension: String(MAX_DIMENSION + 1) })).toContain('dimension');
	});
});
