/**
 * Poisson counts of the isotropic state ρ_η in mutually unbiased bases straight from the
 * white-noise tables (design.ts), without building basis vectors: O(d²) per basis, so that tests
 * and the bench reach d = 1 024 (simulate.ts's exact amplitudes cost O(d³)).
 */
import type { CountsDataset } from '../counts';
import { PoissonSampler, prepareMeans } from '../poisson';
import { whiteNoiseTables } from './design';

export function isotropicCounts(
	d: number,
	visibility: number,
	bases: number[],
	countsPerBasis: number,
	seed: number
): CountsDataset {
	const sampler = new PoissonSampler(seed);
	const model = whiteNoiseTables(d, bases.length, visibility);
	return {
		dimension: d,
		tables: bases.map((basis, i) => {
			const counts = new Float64Array(d * d);
			sampler.drawAll(prepareMeans(model[i].map((p) => p * countsPerBasis)), counts);
			return {
				basis,
				counts,
				accidentals: null,
				durations: null,
				present: new Uint8Array(d * d).fill(1)
			};
		})
	};
}

/** The JSON counts form of product.md, written row by row (a d = 1 024 table is 10⁶ numbers). */
export function toCountsJson(dataset: CountsDataset): string {
	const d = dataset.dimension;
	const tables = dataset.tables.map((t) => {
		const rows = Array.from(
			{ length: d },
			(_, a) => `[${t.counts.subarray(a * d, (a + 1) * d).join(',')}]`
		);
		return `{"basis":${t.basis},"counts":[${rows.join(',\n')}]}`;
	});
	return `{"dimension":${d},"tables":[${tables.join(',\n')}]}\n`;
}
