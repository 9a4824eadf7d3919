/**
 * The words and numbers pages show for each method come from its witness family (issue 7 §4,
 * "one source"): its symbol, its trust, and its maximum, checked against witnesses.md.
 */
import { describe, expect, it } from 'vitest';
import { METHOD_IDS, outcomeProbabilities, states, witnessFamilies } from '../../src/lib/certify';

describe('method metadata on the witness families', () => {
	it('names each statistic by the letter of witnesses.md §4 (S, W, F̃)', () => {
		expect(METHOD_IDS.map((id) => witnessFamilies[id].symbol)).toEqual(['S', 'W', 'F̃']);
	});

	it('says which side is trusted: side B only for the steering test (witnesses.md §4.2)', () => {
		expect(witnessFamilies['steering-2mub'].trustedSides).toBe('side B trusted, side A untrusted');
		expect(witnessFamilies['mub-correlation'].trustedSides).toBe('both sides trusted');
		expect(witnessFamilies['fidelity-two-basis'].trustedSides).toBe('both sides trusted');
	});

	// Φ_d reaches each maximum: S = 1 + (m − 1)·d/d = m (§4.1 tightness, Morelli, Huber &
	// Tavakoli, PRL 131, 170201 (2023)), W = β_d = 2 (§4.2 check), F̃ = 1 (§4.3 check).
	it.each([
		['mub-correlation', 5, [0, 1, 2]],
		['mub-correlation', 7, [0, 1]],
		['steering-2mub', 5, [0, 1]],
		['fidelity-two-basis', 5, [0, 1]]
	] as const)('%s in d = %i with bases %j: Φ_d reaches the stated maximum', (id, d, bases) => {
		const family = witnessFamilies[id];
		const p = bases.map((t) => outcomeProbabilities(states.isotropic(d, 1), t));
		expect(family.statistic(p, d, [...bases])).toBeCloseTo(family.maximum([...bases]), 10);
		// And every rung of the ladder lies below it, else no state could clear the top rung.
		for (const bound of family.bounds(d, [...bases]))
			expect(bound).toBeLessThanOrEqual(family.maximum([...bases]) + 1e-12);
	});
});
