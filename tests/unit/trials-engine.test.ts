/** The time-ordered trials engine (issue 20): parsing, settings check, determinism, power. */
import { gzipSync } from 'node:zlib';
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import {
	betAgainst,
	certifyTrials,
	checkSettings,
	closedTestingRung,
	isotropicTrialsCsv,
	mulberry32,
	parseTrials,
	TRIALS_LABEL,
	TrialsParser,
	upperGamma,
	unitsNeeded,
	type TrialsMode
} from '../../src/lib/certify/trials';
import { plainTrialsBytes } from '../../src/lib/certify/trials/inflate';
import { recheckTrials, rerunTrials } from '../../src/lib/certify/trials/recheck';

const bytes = (text: string) => new TextEncoder().encode(text);
const parse = (text: string, d = 3, mode: TrialsMode = 'trials') =>
	parseTrials(bytes(text), d, mode);

describe('trials CSV', () => {
	it('reads header, comments, CRLF and BOM; sums the trials into count tables', () => {
		const data = parse(
			'\ufeff# run 7\r\nbasis,outcome_a,outcome_b,time_s\r\n0,1,1,0.5\r\n1,2,0,0.5\r\n0,1,1,2\n'
		);
		expect(data.trials).toBe(3);
		expect(Array.from(data.codes)).toEqual([1, 2, 1]);
		expect(data.tables.get(0)![1 * 3 + 1]).toBe(2);
		expect(data.tables.get(1)![2 * 3 + 0]).toBe(1);
	});

	it('gives the same data however the file is cut into chunks', () => {
		const text = 'basis,outcome_a,outcome_b,block\n0,1,1,0\n0,2,1,0\n1,0,0,1\n1,1,1,1\n0,0,0,4\n';
		const whole = parse(text, 3, 'blocks');
		for (let cut = 1; cut < text.length; cut++) {
			const parser = new TrialsParser(3, 'blocks');
			parser.push(bytes(text.slice(0, cut)));
			parser.push(bytes(text.slice(cut)));
			expect(parser.finish()).toEqual(whole);
		}
		expect(Array.from(whole.blocks!.rows)).toEqual([2, 2, 1]);
		expect(Array.from(whole.blocks!.matches)).toEqual([1, 2, 1]);
	});

	it.each([
		['basis,outcome_a,outcome_x\n', /line 1, column 3: unknown column 'outcome_x'/],
		['basis,outcome_a\n', /line 1: the header lacks column 'outcome_b'/],
		['basis,outcome_a,outcome_b\n0,3,1\n', /line 2, column 2: outcome_a must be 0..2, got 3/],
		['basis,outcome_a,outcome_b\n0,1,x\n', /line 2, column 3: outcome_b must be a whole number/],
		['basis,outcome_a,outcome_b\n0,1\n', /line 2, column 3: expected 3 fields, got 2/],
		['basis,outcome_a,outcome_b\n7,1,1\n', /line 2, column 1: basis: basis 7 does not exist/],
		[
			'basis,outcome_a,outcome_b,time_s\n0,1,1,2\n0,1,1,1.5\n',
			/line 3, column 4: time_s 1.5 is earlier/
		],
		['basis,outcome_a,outcome_b\n', /header but no trials/]
	])('refuses %j naming line and column', (text, message) => {
		expect(() => parse(text)).toThrow(message);
	});

	it.each([
		['basis,outcome_a,outcome_b\n0,1,1\n', /mode blocks needs a 'block' column/],
		[
			'basis,outcome_a,outcome_b,block\n0,1,1,3\n0,1,1,2\n',
			/line 3, column 4: block 2 comes after block 3/
		],
		[
			'basis,outcome_a,outcome_b,block\n0,1,1,3\n1,1,1,3\n',
			/line 3, column 1: block 3 mixes bases 0 and 1/
		]
	])('blocks: refuses %j', (text, message) => {
		expect(() => parse(text, 3, 'blocks')).toThrow(message);
	});
});

describe('settings randomness check', () => {
	it('Q(a, x) agrees with jstat: chi-square and normal tails', () => {
		for (const [k, x] of [
			[1, 0.5],
			[1, 10.83],
			[2, 3],
			[7, 20],
			[30, 25]
		])
			expect(upperGamma(k / 2, x / 2)).toBeCloseTo(1 - jStat.chisquare.cdf(x, k), 10);
		// Two-sided normal tail 2(1 − Φ(z)) = Q(1/2, z²/2): 0.05 at z = 1.959964 (handbook value).
		expect(upperGamma(0.5, 1.959964 ** 2 / 2)).toBeCloseTo(0.05, 6);
		expect(upperGamma(0.5, 3.29 ** 2 / 2)).toBeCloseTo(
			1 - jStat.gamma.cdf(3.29 ** 2 / 2, 0.5, 1),
			10
		);
	});

	it('keeps its stated level: truly random settings are flagged at most 2 × 0.001 within error', () => {
		const random = mulberry32(21);
		const settings = new Uint16Array(1000);
		let flagged = 0;
		for (let e = 0; e < 4000; e++) {
			for (let i = 0; i < settings.length; i++) settings[i] = random() < 0.3 ? 0 : 1;
			if (!checkSettings(settings, [0, 1], [0.3, 0.7]).passed) flagged++;
		}
		// 2α·N = 8, plus three binomial standard deviations (≈ 8.5).
		expect(flagged).toBeLessThanOrEqual(17);
	});

	it('random settings pass; alternating, blocked and skewed ones are flagged', () => {
		const random = mulberry32(3);
		const fair = new Uint16Array(5000).map(() => (random() < 0.5 ? 0 : 1));
		expect(checkSettings(fair, [0, 1], [0.5, 0.5]).passed).toBe(true);
		const alternating = new Uint16Array(5000).map((_, i) => i % 2);
		expect(checkSettings(alternating, [0, 1], [0.5, 0.5]).message).toMatch(/change 4999 times/);
		const halves = new Uint16Array(5000).map((_, i) => (i < 2500 ? 0 : 1));
		expect(checkSettings(halves, [0, 1], [0.5, 0.5]).passed).toBe(false);
		expect(checkSettings(fair, [0, 1], [0.3, 0.7]).message).toMatch(/frequencies do not match/);
	});
});

describe('the certificate from time-ordered trials', () => {
	it('closed testing: SN ≥ k only when every lower rung is rejected', () => {
		expect(closedTestingRung([0.001, 0.5, 0.001], 0.01)).toBe(2);
		expect(closedTestingRung([0.001, 0.001], 0.01)).toBe(3);
		expect(closedTestingRung([0.2], 0.01)).toBe(1);
	});

	it('trials needed: the aGRAPA bet at the observed rate, worked by hand', () => {
		// 90 % matches against μ = 0.8: g = 0.1, σ² = 0.09, λ = min(0.1/0.1, 0.5/0.8) = 0.625;
		// growth 0.9·ln 1.125 + 0.1·ln 0.5 = 0.0366902…, and ln(100)/growth = 125.5… → 126.
		const codes = new Uint16Array(1000).map((_, i) => (i % 10 === 0 ? 0 : 1));
		expect(unitsNeeded(codes, new Float64Array([0, 1]), 0.8, 0.01)).toBe(126);
		expect(unitsNeeded(codes, new Float64Array([0, 1]), 0.95, 0.01)).toBeNull();
	});

	it('the running log₁₀ M_n: one point per step, the last at N', () => {
		const codes = new Uint16Array(1001).map((_, i) => (i % 10 === 0 ? 0 : 1));
		const path = betAgainst(codes, new Float64Array([0, 1]), 0.8, 1, 200);
		expect(path.traceStep).toBe(6);
		expect(path.trace.length).toBe(167);
		expect(path.trace[166]).toBe(path.log10Final);
		expect(path.log10Peak).toBeGreaterThanOrEqual(Math.max(...path.trace));
	});

	it('predictable settings let a separable source certify SN d; the settings check refuses it', () => {
		// Settings alternate 0, 1, 0, …; the source sends the product eigenstate of the coming one.
		const d = 8;
		const rows = Array.from({ length: 2000 }, (_, i) => `${i % 2},${i % d},${i % d}`);
		const data = parse(`basis,outcome_a,outcome_b\n${rows.join('\n')}\n`, d);
		const result = certifyTrials(data, { method: 'mub-correlation', confidence: 0.99 });
		expect(result.ladderSchmidtNumber).toBe(d);
		expect(result.settings.passed).toBe(false);
		expect(result.certifiedSchmidtNumber).toBe(1);
		expect(result.settings.message).toMatch(/do not look random/);
	});

	it('is deterministic to the bit and labelled', () => {
		const data = parse(isotropicTrialsCsv(8, 0.8, [0, 1], 20_000, 4), 8);
		const one = certifyTrials(data, { method: 'mub-correlation', confidence: 0.99 });
		const two = certifyTrials(data, { method: 'mub-correlation', confidence: 0.99 });
		expect(JSON.stringify(two.rungs)).toBe(JSON.stringify(one.rungs));
		expect(one.label).toBe(TRIALS_LABEL);
		expect(one.trials).toBe(20_000);
	});

	it('a verifier re-computes every p-value bit for bit and names a changed one', () => {
		const file = bytes(isotropicTrialsCsv(5, 0.85, [0, 1], 5000, 6));
		const result = certifyTrials(parseTrials(file, 5, 'trials'), {
			method: 'mub-correlation',
			probabilities: [0.5, 0.5]
		});
		const recorded = JSON.parse(JSON.stringify(result));
		expect(recheckTrials(file, recorded)).toEqual({ matches: true, differences: [] });
		recorded.rungs[1].log10P = result.rungs[1].log10P * (1 + Number.EPSILON);
		expect(recheckTrials(file, recorded).differences).toEqual([
			expect.stringMatching(/^rung 2 log10 p: recorded/)
		]);
	});

	it('blocks: one value per block, its matching fraction over m π_t, and the condition stated', () => {
		const text = 'basis,outcome_a,outcome_b,block\n0,1,1,0\n0,2,1,0\n1,0,0,1\n1,1,1,1\n0,0,0,4\n';
		const result = certifyTrials(parse(text, 3, 'blocks'), {
			method: 'mub-correlation',
			probabilities: [0.25, 0.75]
		});
		// Y = (1/2)/(2·0.25), (2/2)/(2·0.75), (1/1)/(2·0.25): mean (1 + 2/3 + 2)/3.
		expect(result.meanZ).toBeCloseTo((1 + 2 / 3 + 2) / 3, 14);
		expect(result.blocks).toBe(3);
		expect(result.condition).toMatch(/receives nothing from the detectors during the block/);
	});

	it('refuses a method without a per-trial matching sum, and probabilities that do not add to 1', () => {
		const data = parse(isotropicTrialsCsv(3, 0.9, [0, 1], 100, 1));
		expect(() => certifyTrials(data, { method: 'fidelity-two-basis' })).toThrow(/mub-correlation/);
		expect(() =>
			certifyTrials(data, { method: 'mub-correlation', probabilities: [0.5, 0.6] })
		).toThrow(/add up to 1/);
	});

	it('power: Φ_31 at visibility 0.9, 10⁶ trials in two bases, within one rung of the i.i.d. certificate', () => {
		const data = parse(isotropicTrialsCsv(31, 0.9, [0, 1], 1_000_000, 31), 31);
		const result = certifyTrials(data, { method: 'mub-correlation' });
		const iid = result.iid as { certifiedSchmidtNumber: number };
		expect(
			Math.abs(result.certifiedSchmidtNumber - iid.certifiedSchmidtNumber)
		).toBeLessThanOrEqual(1);
		// S = 2(v + (1 − v)/31) = 1 + 25/31 at v = 0.9 (witnesses.md §4.1): B_r = 1 + r/31 is passed up to r = 24.
		expect(result.certifiedSchmidtNumber).toBeGreaterThanOrEqual(24);
	});
});

describe('re-reading a gzip-compressed trials file (the verifier’s path)', () => {
	// gzip (RFC 1952) through node's zlib: the same rows whether the file was uploaded plain or compressed.
	it('re-computes the same p-values from the gzip file as from the plain one', () => {
		const text = isotropicTrialsCsv(5, 0.85, [0, 1], 3000, 9);
		const recorded = JSON.parse(
			JSON.stringify(certifyTrials(parse(text, 5), { method: 'mub-correlation' }))
		);
		expect(recheckTrials(gzipSync(bytes(text)), recorded)).toEqual({
			matches: true,
			differences: []
		});
		expect(rerunTrials(gzipSync(bytes(text)), recorded)).toEqual(
			rerunTrials(bytes(text), recorded)
		);
	});

	it('refuses a gzip file that inflates past the cap, and one that is not gzip inside', () => {
		const text = isotropicTrialsCsv(3, 0.9, [0, 1], 2000, 2);
		expect(() => plainTrialsBytes(gzipSync(bytes(text)), 100)).toThrow(
			/inflates to more than 100 bytes/
		);
		const broken = gzipSync(bytes(text)).slice(0, 40);
		expect(() => plainTrialsBytes(broken)).toThrow(/not a readable gzip file/);
	});
});
