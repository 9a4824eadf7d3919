/**
 * Grid counts files (issue 18): one d × d matrix per basis after a `# basis t` line, tab,
 * semicolon, comma or space separated. The same counts written as grids and in the long form
 * must give the same canonical text; every error names its line (and column for a value).
 */
import { describe, expect, it } from 'vitest';
import {
	parseCounts,
	sampledCounts,
	states,
	toCountsCsv,
	type CountsDataset
} from '../../src/lib/certify';
import { canonicalCountsText } from '../../src/lib/evidence/manifest';

const d = 5;
const dataset = sampledCounts(states.isotropic(d, 0.9), [0, 1, 2], 20_000, 3);

function asGrids(data: CountsDataset, sep: string, eol = '\n'): string {
	const lines = ['# run 3, Halvorsen Lake (simulated)'];
	for (const t of data.tables) {
		lines.push(`# basis ${t.basis}`);
		for (let a = 0; a < d; a++)
			lines.push(Array.from({ length: d }, (_, b) => t.counts[a * d + b]).join(sep));
		lines.push('');
	}
	return lines.join(eol);
}

const longForm = canonicalCountsText(parseCounts(toCountsCsv(dataset), d));

describe('grids read as the long form reads the same counts', () => {
	it.each([
		['\t', 'tab-separated'],
		[';', 'semicolon-separated'],
		[',', 'comma-separated'],
		['  ', 'space-separated']
	])('separator %j', (sep, words) => {
		const parsed = parseCounts(asGrids(dataset, sep), d);
		expect(canonicalCountsText(parsed)).toBe(longForm);
		expect(parsed.readAs).toBe(`read as 3 grids of 5 × 5, ${words}`);
	});

	it('takes CRLF line ends and a byte-order mark, as bytes', () => {
		const bytes = new TextEncoder().encode('\uFEFF' + asGrids(dataset, ';', '\r\n'));
		expect(canonicalCountsText(parseCounts(bytes, d))).toBe(longForm);
	});

	it('reads one grid whose basis is given on its first comment line', () => {
		const one = asGrids({ ...dataset, tables: [dataset.tables[1]] }, '\t').replace(
			/^# run.*\n/,
			''
		);
		const parsed = parseCounts(one, d);
		expect(parsed.tables.map((t) => t.basis)).toEqual([1]);
		expect(parsed.readAs).toBe('read as 1 grid of 5 × 5, tab-separated');
	});

	it('leaves long-form files to the long-form reader', () => {
		expect(parseCounts(toCountsCsv(dataset), d).readAs).toBeUndefined();
	});
});

describe('errors name the line and column', () => {
	const good = asGrids(dataset, '\t');
	const lines = good.split('\n');

	it('a grid with no basis line', () => {
		expect(() => parseCounts('1\t2\t3\t4\t5\n'.repeat(5), d)).toThrow(
			/^line 1: say which basis this grid is in/
		);
	});

	it('a row of the wrong length, a value that is no count, a short grid', () => {
		const short = [...lines];
		short[3] = '1\t2\t3\t4';
		expect(() => parseCounts(short.join('\n'), d)).toThrow(
			/^line 4: a grid row needs 5 values \(d = 5\), found 4/
		);
		const bad = [...lines];
		bad[4] = '1\t2\tx7\t4\t5';
		expect(() => parseCounts(bad.join('\n'), d)).toThrow(
			/^line 5, column 3: counts must be a non-negative whole number, got 'x7'/
		);
		const missing = [...lines];
		missing.splice(6, 1); // basis 0 loses its last row
		expect(() => parseCounts(missing.join('\n'), d)).toThrow(
			/^line 8: the grid for basis 0 \(from line 3\) has 4 rows, not 5/
		);
	});

	it('a sixth row with no basis line, a basis twice, a basis outside the range', () => {
		const extra = [...lines];
		extra.splice(7, 0, '1\t1\t1\t1\t1');
		expect(() => parseCounts(extra.join('\n'), d)).toThrow(/^line 8: a grid starts here without/);
		const twice = good.replace('# basis 1', '# basis 0');
		expect(() => parseCounts(twice, d)).toThrow(/basis 0 has a grid already/);
		const far = good.replace('# basis 2', '# basis 9');
		expect(() => parseCounts(far, d)).toThrow(/^line \d+, column 9: /);
	});
});
