/**
 * Keep the power (issue 6): on well-measured isotropic data the new bounds certify what engine
 * 1.0.0's percentile Poisson bootstrap certified wherever that bound cleared its rung by more
 * than one standard error; the fidelity bound at most one rung less. The old bound is rebuilt
 * here from the Poisson sampler that remains (bootstrapReplicates, x_(⌈qB⌉)).
 */
import { describe, expect, it } from 'vitest';
import {
	certify,
	sampledCounts,
	states,
	witnessFamilies,
	type MethodId
} from '../../src/lib/certify';
import {
	bootstrapReplicates,
	empiricalQuantile,
	standardDeviation
} from '../../src/lib/certify/bootstrap';
import { ladderPosition } from '../../src/lib/certify/ladder';

function oldPercentileBound(method: MethodId, data: ReturnType<typeof sampledCounts>) {
	const d = data.dimension;
	const model = witnessFamilies[method].sufficientModel(data.tables, d, [0, 1]);
	const reps = bootstrapReplicates(model, { resamples: 2000, seed: 11 });
	const sorted = Float64Array.from(reps).sort();
	return { lower: empiricalQuantile(sorted, 1 - 0.99865), se: standardDeviation(reps) };
}

describe('the new bounds keep the power of the old ones on well-measured data', () => {
	for (const d of [5, 10, 13, 31]) {
		for (const eta of [0.9, 0.97]) {
			it(`isotropic d = ${d}, η = ${eta}, 10^5 counts per basis`, () => {
				const data = sampledCounts(states.isotropic(d, eta), [0, 1], 1e5, 40 + d);
				let compared = 0;
				for (const method of ['mub-correlation', 'steering-2mub', 'fidelity-two-basis'] as const) {
					const bounds = witnessFamilies[method].bounds(d, [0, 1]);
					const old = oldPercentileBound(method, data);
					const oldCertified = ladderPosition(old.lower, bounds);
					const rung = oldCertified >= 2 ? bounds[oldCertified - 2] : -Infinity;
					const now = certify(data, { method, resamples: 2000 }).certifiedSchmidtNumber;
					if (method === 'fidelity-two-basis') {
						expect(now).toBeGreaterThanOrEqual(oldCertified - 1);
						compared++;
					} else if (old.lower - rung > old.se) {
						expect(now).toBe(oldCertified);
						compared++;
					}
				}
				expect(compared).toBeGreaterThanOrEqual(2);
			});
		}
	}
});
