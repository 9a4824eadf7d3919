/**
 * Engine 2.1.0: replicates in fixed blocks, one stream per (seed, block), so that results do not
 * depend on how many threads draw the blocks; the Erlang draws of small whole Gamma shapes; the
 * CSV parser's fast path for plain rows.
 */
import fc from 'fast-check';
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import {
	certify,
	certifyInBlocks,
	parseCountsCsv,
	sampledCounts,
	states,
	toCountsCsv,
	type BlockRunner,
	type CountsDataset
} from '../../src/lib/certify';
import {
	BLOCK_RESAMPLES,
	blockCount,
	drawBlocks,
	drawReplicates,
	drawsOf
} from '../../src/lib/certify/confidence';
import { GammaSampler } from '../../src/lib/certify/gamma';

/** A runner that draws the blocks in the given split, last range first (any order, any split). */
function splitRunner(cuts: number[]): BlockRunner {
	return async (spec, resamples, seed) => {
		const blocks = blockCount(resamples);
		const edges = [0, ...cuts.map((c) => c % (blocks + 1)).sort((a, b) => a - b), blocks];
		const parts = edges
			.slice(1)
			.map((to, i) => drawBlocks(drawsOf(spec), resamples, seed, edges[i], to))
			.reverse();
		const lower = new Float64Array(resamples);
		const upper = new Float64Array(resamples);
		let at = resamples;
		for (const part of parts) {
			at -= part.lower.length;
			lower.set(part.lower, at);
			upper.set(part.upper, at);
		}
		return { lower, upper };
	};
}

const d7 = sampledCounts(states.isotropic(7, 0.9), [0, 1, 2], 20_000, 11);
const withRates: CountsDataset = {
	...d7,
	tables: d7.tables.map((t, i) => ({
		...t,
		durations: new Float64Array(t.counts.length).fill(1 + i / 4)
	}))
};

describe('blocks of resamples (engine 2.1.0)', () => {
	const cases = [
		{ name: 'correlation sum, sufficient totals', data: d7, method: 'mub-correlation' },
		{ name: 'fidelity bound, sufficient totals', data: d7, method: 'fidelity-two-basis' },
		{ name: 'steering, per-cell draws (rates)', data: withRates, method: 'steering-2mub' }
	];
	for (const { name, data, method } of cases) {
		it(`${name}: any split of the blocks gives exactly certify()'s result`, async () => {
			const options = { method, resamples: 2_500, seed: 9 };
			const whole = certify(data, options);
			// Property: for every split into up to five ranges (threads), the result is identical.
			await fc.assert(
				fc.asyncProperty(fc.array(fc.nat(3), { maxLength: 4 }), async (cuts) => {
					expect(await certifyInBlocks(data, options, splitRunner(cuts))).toEqual(whole);
				}),
				{ numRuns: 12, seed: 3 }
			);
		});
	}

	it('block b draws from its own stream: blocks differ, and a block depends only on (seed, b)', () => {
		const spec = {
			kind: 'sufficient' as const,
			tables: d7.tables,
			d: 7,
			subtractAccidentals: false
		};
		const all = drawReplicates(drawsOf(spec), { resamples: 3 * BLOCK_RESAMPLES, seed: 4 });
		const second = drawBlocks(drawsOf(spec), 3 * BLOCK_RESAMPLES, 4, 1, 2);
		expect(second.lower).toEqual(all.lower.slice(BLOCK_RESAMPLES, 2 * BLOCK_RESAMPLES));
		expect(all.lower[0]).not.toBe(all.lower[BLOCK_RESAMPLES]);
		const otherSeed = drawBlocks(drawsOf(spec), 3 * BLOCK_RESAMPLES, 5, 1, 2);
		expect(otherSeed.lower[0]).not.toBe(second.lower[0]);
		// A last, partial block: 2 500 resamples are blocks of 1000, 1000 and 500.
		expect(blockCount(2_500)).toBe(3);
		expect(drawBlocks(drawsOf(spec), 2_500, 4, 2, 3).lower.length).toBe(500);
	});
});

describe('Gamma draws of whole shapes up to 4 as −ln(U₁⋯U_a) (Erlang; Devroye 1986 §IX.3)', () => {
	// KS test against jstat's Gamma CDF (an independent library); 1.63/√n is the 1 % critical
	// value (Kolmogorov's asymptotic distribution, any statistics handbook). Shape 5 is the first
	// drawn by Marsaglia–Tsang again.
	for (const shape of [3, 4, 5]) {
		it(`matches Gamma(${shape}, 1)`, () => {
			const g = new GammaSampler(77, 3);
			const n = 20_000;
			const sample = Array.from({ length: n }, () => g.gamma(shape)).sort((a, b) => a - b);
			let worst = 0;
			sample.forEach((x, i) => {
				const f = jStat.gamma.cdf(x, shape, 1);
				worst = Math.max(worst, Math.abs(f - i / n), Math.abs((i + 1) / n - f));
			});
			expect(worst).toBeLessThan(1.63 / Math.sqrt(n));
		});
	}
});

describe('the CSV fast path for plain rows', () => {
	it('gives the same tables as the worded path (spaces, CRLF and comments force it)', () => {
		// Property (common practice: two parsers of one format must agree on every valid file).
		fc.assert(
			fc.property(fc.array(fc.nat(10 ** 9), { minLength: 18, maxLength: 18 }), (counts) => {
				const data = sampledCounts(states.isotropic(3, 0.5), [0, 1], 1000, 1);
				data.tables[0].counts.set(counts.slice(0, 9));
				data.tables[1].counts.set(counts.slice(9));
				const plain = toCountsCsv(data);
				const worded = plain.replace(/,/g, ' , ').replace(/\n/g, '\r\n# note\r\n');
				expect(parseCountsCsv(plain, 3)).toEqual(parseCountsCsv(worded, 3));
				expect(parseCountsCsv(plain, 3).tables[1].counts).toEqual(data.tables[1].counts);
			}),
			{ numRuns: 50, seed: 8 }
		);
	});

	it('a duplicate or out-of-range plain row still gets its worded error', () => {
		const head = 'basis,outcome_a,outcome_b,counts\n0,0,0,5\n';
		expect(() => parseCountsCsv(head + '0,0,0,6\n', 2)).toThrow(
			/duplicate cell basis=0, outcome_a=0, outcome_b=0 \(first on line 2\)/
		);
		expect(() => parseCountsCsv(head + '0,2,0,6\n', 2)).toThrow(/outcome_a 2 is outside 0..1/);
		expect(() => parseCountsCsv(head + '0,1,0,12345678901234567\n', 2)).toThrow(
			/counts 12345678901234567 is too large/
		);
	});
});
