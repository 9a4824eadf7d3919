import { describe, expect, it } from 'vitest';
import { parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { firstDifference } from '../../src/lib/evidence/compare';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { canonicalCountsText, fingerprintOf } from '../../src/lib/evidence/manifest';

describe('canonical counts', () => {
	const dataset = sampledCounts(states.isotropic(3, 0.8), [0, 1], 5_000, 3);
	const csv = toCountsCsv(dataset, ['a comment that must not matter']);
	const d = dataset.dimension;
	const rows = (t: (typeof dataset.tables)[number]) =>
		Array.from({ length: d }, (_, a) => Array.from(t.counts.subarray(a * d, a * d + d)));

	it('gives one text for the same counts in the CSV form, reordered CSV and the JSON form', () => {
		const [header, ...lines] = csv.split('\n').filter((l) => l && !l.startsWith('#'));
		const reordered = [header, ...lines.reverse()].join('\r\n');
		const json = JSON.stringify(
			{ tables: dataset.tables.map((t) => ({ basis: t.basis, counts: rows(t) })), dimension: d },
			null,
			2
		);
		const expected = canonicalCountsText(parseCounts(csv, d));
		expect(canonicalCountsText(parseCounts(reordered, d))).toBe(expected);
		expect(canonicalCountsText(parseCounts(json, d))).toBe(expected);
		expect(JSON.parse(expected)).toEqual({
			dimension: d,
			tables: dataset.tables.map((t) => ({ basis: t.basis, counts: rows(t) }))
		});
	});

	it('changes when one count changes', () => {
		const changed = csv.replace(/^0,0,0,(\d+)$/m, (_, n) => `0,0,0,${Number(n) + 1}`);
		expect(changed).not.toBe(csv);
		expect(canonicalCountsText(parseCounts(changed, d))).not.toBe(
			canonicalCountsText(parseCounts(csv, d))
		);
	});
});

describe('fingerprint and comparison', () => {
	it('takes the fingerprint as the SHA-256 of the manifest text (FIPS 180-4 "abc" example)', () => {
		expect(fingerprintOf('abc')).toBe(
			'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'
		);
		expect(fingerprintOf('{"a":1}')).toBe(sha256Hex(new TextEncoder().encode('{"a":1}')));
	});

	it('names the first differing number by its path, and nothing for equal values', () => {
		const a = {
			statistic: { value: 1, interval95: [0.5, 1.5] },
			bounds: [{ bound: 1 }, { bound: 2 }]
		};
		expect(firstDifference(a, structuredClone(a))).toBeNull();
		expect(firstDifference(a, { ...a, bounds: [{ bound: 1 }, { bound: 2 + 1e-15 }] })).toBe(
			'bounds[1].bound'
		);
		expect(
			firstDifference(a, { ...a, statistic: { value: 1, interval95: [0.5, 1.5000001] } })
		).toBe('statistic.interval95[1]');
		expect(firstDifference(a, { ...a, extra: null })).toBe('extra');
		expect(firstDifference([1, 2], [1, 2, 3])).toBe('[2]');
	});
});
