/**
 * Counts sets (issue 18): several files uploaded together as one dataset, each a single d × d grid
 * with its basis given beside it, or a full file. The set keeps every file's bytes (their SHA-256
 * by node:crypto, an outside implementation of FIPS 180-4); its counts read as the same counts in
 * one long-form file do; a fault names the file and its own line and column.
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { splitCountsSet, writeCountsSet } from '../../src/lib/certify/counts-set';
import { canonicalCountsText } from '../../src/lib/evidence/manifest';

const d = 5;
const dataset = sampledCounts(states.isotropic(d, 0.9), [0, 1, 2], 20_000, 3);
const bytes = (text: string) => new TextEncoder().encode(text);

/** Basis t's table as a lab saves it: one bare grid, `sep`-separated, no basis line. */
const bareGrid = (t: number, sep = '\t') =>
	Array.from({ length: d }, (_, a) =>
		Array.from({ length: d }, (_, b) => dataset.tables[t].counts[a * d + b]).join(sep)
	).join('\n') + '\n';

const longForm = canonicalCountsText(parseCounts(toCountsCsv(dataset), d));
const basis2Csv = toCountsCsv({ ...dataset, tables: [dataset.tables[2]] });

const set = (files: { name: string; text: string; basis: number | null }[]) =>
	writeCountsSet(files.map((f) => ({ name: f.name, bytes: bytes(f.text), basis: f.basis })));

describe('a counts set of grids and full files', () => {
	const files = [
		{ name: 'h-basis.tsv', text: bareGrid(0), basis: 0 },
		{ name: 'fourier.csv', text: bareGrid(1, ';'), basis: 1 },
		{ name: 'third.csv', text: basis2Csv, basis: null }
	];

	it('reads as the same counts as one long-form file (one canonical SHA-256)', () => {
		const parsed = parseCounts(set(files), d);
		expect(canonicalCountsText(parsed)).toBe(longForm);
		expect(parsed.readAs).toBe(
			'read as 3 files — h-basis.tsv: 1 grid of 5 × 5 in basis 0 (given with the upload), tab-separated; ' +
				'fourier.csv: 1 grid of 5 × 5 in basis 1 (given with the upload), semicolon-separated; ' +
				'third.csv: basis 2'
		);
	});

	it('keeps every file byte for byte, with its SHA-256 in its header', () => {
		const stored = set(files);
		const split = splitCountsSet(stored);
		expect(split.map((f) => [f.name, f.basis])).toEqual(files.map((f) => [f.name, f.basis]));
		split.forEach((f, i) => {
			expect(new TextDecoder().decode(f.bytes)).toBe(files[i].text);
			const hex = createHash('sha256').update(files[i].text).digest('hex');
			expect(new TextDecoder().decode(stored)).toContain(`sha256=${hex} basis=`);
		});
	});

	it('names the file and its own line and column when the second file is bad', () => {
		const typo = bareGrid(1).split('\n');
		typo[2] = typo[2].replace(/^(\d+)\t(\d+)/, '$1\tx$2');
		const bad = set([files[0], { name: 'fourier.csv', text: typo.join('\n'), basis: 1 }]);
		expect(() => parseCounts(bad, d)).toThrow(
			/^line 3, column 2: in fourier\.csv \(file 2 of 2\): counts must be a non-negative whole number, got 'x\d+'$/
		);
	});

	it('refuses one basis in two files, naming both', () => {
		const twice = set([files[0], { name: 'again.tsv', text: bareGrid(0), basis: 0 }]);
		expect(() => parseCounts(twice, d)).toThrow(
			'in again.tsv (file 2 of 2): basis 0 is in h-basis.tsv already'
		);
	});

	it('refuses a grid without a basis, and a basis beside a file that names its own', () => {
		const unnamed = set([files[0], { name: 'b.tsv', text: bareGrid(1), basis: null }]);
		expect(() => parseCounts(unnamed, d)).toThrow(
			/^line 1: in b\.tsv \(file 2 of 2\): say which basis .* or give the basis beside the file$/
		);
		const named = set([{ name: 'c.csv', text: basis2Csv, basis: 2 }]);
		expect(() => parseCounts(named, d)).toThrow(/in c\.csv \(file 1 of 1\): a basis given beside/);
		const alone = parseCounts(set([{ name: 'one.tsv', text: bareGrid(1), basis: 1 }]), d);
		expect(alone.readAs).toBe(
			'read as 1 file — one.tsv: 1 grid of 5 × 5 in basis 1 (given with the upload), tab-separated'
		);
		const missing = set([{ name: 'd.tsv', text: bareGrid(0), basis: 7 }]);
		expect(() => parseCounts(missing, d)).toThrow(/basis 7 does not exist in dimension 5/);
	});

	it('refuses a set whose bytes were changed after it was written', () => {
		const stored = set(files);
		const at = new TextDecoder().decode(stored).lastIndexOf('\n2,');
		stored[at + 1] = '1'.charCodeAt(0);
		expect(() => parseCounts(stored, d)).toThrow(
			'the counts set is damaged: the SHA-256 of file 3'
		);
	});

	it('shares one table budget across its files: nine one-row files in d = 1 024 stop at the ninth', () => {
		// d = 1 024 = 2^10 has 1 025 bases; each one-row file still asks for a whole d² table.
		const nine = Array.from({ length: 9 }, (_, t) => ({
			name: `f${t}.csv`,
			text: `basis,outcome_a,outcome_b,counts\n${t},0,0,1\n`,
			basis: null
		}));
		expect(() => parseCounts(set(nine), 1024)).toThrow(
			/^line 2: in f8\.csv \(file 9 of 9\): basis 8: the file's tables would hold more than 8 388 608 numbers/
		);
	});
});
