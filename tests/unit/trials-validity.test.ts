/**
 * Validity of the time-ordered certificate against sources with memory (issue 20): a true H_r is
 * rejected at most at α = 0.01 within its binomial error, over 10⁴ simulated experiments for each
 * adversary and d ∈ {3, 8, 31}. Ville's inequality (Ville 1939) is the theorem; these runs check
 * the implementation keeps its premises (predictable bets, factors ≥ 0).
 */
import { describe, expect, it } from 'vitest';
import { betAgainst, mulberry32, pValue } from '../../src/lib/certify/trials';

const ALPHA = 0.01;
const EXPERIMENTS = 10_000;
const TRIALS = 300;
/** α·N plus three binomial standard deviations. */
const LIMIT = ALPHA * EXPERIMENTS + 3 * Math.sqrt(EXPERIMENTS * ALPHA * (1 - ALPHA));
/**
 * B_r = 1 + (m − 1) r/d for m = 2 MUBs (Spengler et al., Phys. Rev. A 86, 022311 (2012) for r = 1;
 * Morelli, Huber & Tavakoli, Phys. Rev. Lett. 131, 170201 (2023) for r > 1, from memory).
 */
const nullMean = (r: number, d: number) => (1 + r / d) / 2;

/** A source deciding each trial's match probability per basis from everything before it. */
type Source = (past: { settings: Uint16Array; codes: Uint16Array; i: number }) => [number, number];

/** Settings drawn with P(basis 0) = pi0; Z = 1{a = b}/(2 π_t) (witnesses.md §10). */
function rejections(
	d: number,
	r: number,
	source: Source,
	seed: number,
	shift = 0,
	pi0 = 0.5
): number {
	const random = mulberry32(seed);
	const values = new Float64Array([0, 1 / (2 * pi0), 0, 1 / (2 * (1 - pi0))]);
	const xMax = Math.max(values[1], values[3]);
	let rejected = 0;
	const codes = new Uint16Array(TRIALS);
	const settings = new Uint16Array(TRIALS);
	for (let e = 0; e < EXPERIMENTS; e++) {
		for (let i = 0; i < TRIALS; i++) {
			const match = source({ settings, codes, i });
			const t = random() < pi0 ? 0 : 1; // drawn after the source has committed
			settings[i] = t;
			codes[i] = 2 * t + (random() < match[t] ? 1 : 0);
		}
		const { p } = pValue(betAgainst(codes, values, nullMean(r, d) - shift, xMax));
		if (p <= ALPHA) rejected++;
	}
	return rejected;
}

/** (a) The product eigenstate of a guessed basis g: matches surely in g, with chance 1/d in the other. */
const eigenstateOf = (g: number, d: number): [number, number] =>
	g === 0 ? [1, 1 / d] : [1 / d, 1];

const adversaries: Record<string, (d: number) => [number, Source]> = {
	'(a) separable, guessed setting': (d) => [1, ({ i }) => eigenstateOf(i % 3 === 0 ? 1 : 0, d)],
	'(b) separable, guessing from past settings and outcomes': (d) => [
		1,
		({ settings, codes, i }) =>
			eigenstateOf(
				i === 0 ? 0 : (codes[i - 1] & 1) === 1 ? settings[i - 1] : 1 - settings[i - 1],
				d
			)
	],
	'(c) drifting between Φ_r and white noise': (d) => {
		// Φ_r matches surely in basis 0 and with chance r/d in the Fourier basis; noise with 1/d.
		const r = Math.ceil(d / 2);
		return [
			r,
			({ i }) => {
				const w = 0.5 + 0.5 * Math.sin(i / 40);
				return [w + (1 - w) / d, (w * r) / d + (1 - w) / d];
			}
		];
	}
};

describe('test supermartingale against adaptive sources (witnesses.md §10)', () => {
	for (const d of [3, 8, 31]) {
		for (const [name, make] of Object.entries(adversaries)) {
			it(`${name}, d = ${d}: rejects the true H_r at most α within its error`, () => {
				const [r, source] = make(d);
				expect(rejections(d, r, source, 1000 + d)).toBeLessThanOrEqual(LIMIT);
			});
		}
	}

	it('declared probabilities 0.8 / 0.2, the source betting on the likelier setting, d = 8', () => {
		const source: Source = ({ i }) => eigenstateOf(i % 10 < 8 ? 0 : 1, 8);
		expect(rejections(8, 1, source, 88, 0, 0.8)).toBeLessThanOrEqual(LIMIT);
	});

	it('the experiments can see a broken bound: a null mean 0.1 too low is rejected far more often', () => {
		const [r, source] = adversaries['(a) separable, guessed setting'](8);
		expect(rejections(8, r, source, 7, 0.1)).toBeGreaterThan(5 * LIMIT);
	});
});

describe('blocks: one bet per block on its matching fraction', () => {
	const BLOCKS = 60;
	const ROWS = 5;
	for (const d of [3, 8, 31]) {
		it(`(d) a source switching state between blocks, d = ${d}: at most α within its error`, () => {
			const random = mulberry32(77 + d);
			const codes = new Uint32Array(BLOCKS).map((_, j) => j);
			const fractions = new Float64Array(BLOCKS);
			let rejected = 0;
			for (let e = 0; e < EXPERIMENTS; e++) {
				let last = 0;
				for (let j = 0; j < BLOCKS; j++) {
					// Before the block: the eigenstate of the last block's setting, or Φ_1 every third block.
					const match = j % 3 === 2 ? [1, 1 / d] : eigenstateOf(last, d);
					const t = random() < 0.5 ? 0 : 1;
					let hits = 0;
					for (let k = 0; k < ROWS; k++) if (random() < match[t]) hits++;
					fractions[j] = hits / ROWS;
					last = t;
				}
				if (pValue(betAgainst(codes, fractions, nullMean(1, d), 1)).p <= ALPHA) rejected++;
			}
			expect(rejected).toBeLessThanOrEqual(LIMIT);
		});
	}
});
