/**
 * Many bases at low counts (issue 19 §1): the example of the audit, an isotropic state at
 * visibility 0.96 in d = 61 measured in all 62 bases, certifying Schmidt number 59 (S > B_58 = 59,
 * witnesses.md §4.1). Counts per basis for 50 % power are taken at the median experiment (every
 * basis at its expected counts, rounded): the engine against the exact pooled binomial bound,
 * m·(Clopper–Pearson lower limit of ΣD_t of ΣT_t) (Clopper & Pearson, Biometrika 26, 404 (1934);
 * Beta quantile from jstat), which is exact for equal totals (Hoeffding, Ann. Math. Stat. 27, 713
 * (1956), from memory). Engine 2.1.0 needed 297 counts per basis here, the pooled bound about 67–100.
 */
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { certify, type CountsDataset } from '../../src/lib/certify';

const d = 61;
const m = d + 1;
// Isotropic state: every MUB's matching probability is η + (1 − η)/d (witnesses.md §7).
const p = 0.96 + 0.04 / d;
const alpha = 1 - 0.99865;

/** Every basis with its expected matching count: D on the diagonal, the rest one step off it. */
function medianData(n: number): CountsDataset {
	const matching = Math.round(n * p);
	const tables = Array.from({ length: m }, (_, basis) => {
		const counts = new Float64Array(d * d);
		for (let k = 0; k < matching; k++) counts[(k % d) * (d + 1)] += 1;
		for (let k = 0; k < n - matching; k++) counts[(k % d) * d + ((k + 1) % d)] += 1;
		return {
			basis,
			counts,
			accidentals: null,
			durations: null,
			present: new Uint8Array(d * d).fill(1)
		};
	});
	return { dimension: d, tables };
}

const pooledCertifies = (n: number) => {
	const matching = Math.round(n * p);
	return m * jStat.beta.inv(alpha, m * matching, m * (n - matching) + 1) > 59;
};
const engineCertifies = (n: number) =>
	certify(medianData(n), {
		method: 'mub-correlation',
		bases: [...Array(m).keys()],
		resamples: 8000
	}).certifiedSchmidtNumber >= 59;

/** The fewest counts per basis from which `certifies` holds (checked monotone over the search). */
function countsNeeded(certifies: (n: number) => boolean, lo = 10, hi = 2000): number {
	while (hi - lo > 1) {
		const mid = Math.floor((lo + hi) / 2);
		if (certifies(mid)) hi = mid;
		else lo = mid;
	}
	return hi;
}

describe(
	'all 62 bases of d = 61 at visibility 0.96: counts per basis to certify Schmidt number 59',
	{ timeout: 300_000 },
	() => {
		it('the engine needs at most 1.3 times the counts of the exact pooled bound (50 % power)', () => {
			const pooled = countsNeeded(pooledCertifies);
			expect(pooled).toBeGreaterThan(40);
			expect(pooled).toBeLessThan(110);
			const engine = countsNeeded(engineCertifies, 40, 400);
			expect(engine).toBeLessThanOrEqual(1.3 * pooled);
		});
	}
);
