import { describe, expect, it } from 'vitest';
import { certify, InputError, MAX_COUNTS_FILE_BYTES, parseCounts } from '../../src/lib/certify';

const header = 'basis,outcome_a,outcome_b,counts';
function fullCsv(
	d: number,
	bases: number[],
	value = (a: number, b: number) => (a === b ? 100 : 1)
) {
	const rows = [header];
	for (const t of bases)
		for (let a = 0; a < d; a++)
			for (let b = 0; b < d; b++) rows.push(`${t},${a},${b},${value(a, b)}`);
	return rows.join('\n') + '\n';
}
function errorOf(run: () => unknown): InputError {
	try {
		run();
	} catch (error) {
		expect(error).toBeInstanceOf(InputError);
		return error as InputError;
	}
	throw new Error('expected an InputError');
}

describe('counts CSV (product.md format)', () => {
	it('reads a complete file into one table per basis, cells a·d + b', () => {
		const data = parseCounts(fullCsv(3, [1, 0]), 3);
		expect(data.tables.map((t) => t.basis)).toEqual([0, 1]);
		expect(data.tables[0].counts[0]).toBe(100);
		expect(data.tables[0].counts[1]).toBe(1);
		expect([...data.tables[0].present].every((x) => x === 1)).toBe(true);
	});

	it('accepts a UTF-8 byte-order mark, CRLF line ends, # comments, blank lines and any column order', () => {
		const text =
			'\uFEFF# a comment\r\ncounts,outcome_b,outcome_a,basis\r\n\r\n7,1,0,0\r\n# another\r\n9,0,0,0\r\n';
		const data = parseCounts(new TextEncoder().encode(text), 2);
		expect(data.tables[0].counts[1]).toBe(7);
		expect(data.tables[0].counts[0]).toBe(9);
	});

	it('reads optional accidentals and duration_s columns', () => {
		const data = parseCounts(`${header},accidentals,duration_s\n0,0,0,10,1.5,2\n`, 2);
		expect(data.tables[0].accidentals![0]).toBe(1.5);
		expect(data.tables[0].durations![0]).toBe(2);
	});

	const cases: [string, string, number, RegExp, number?, number?][] = [
		[
			'unknown column',
			'basis,outcome_a,outcome_b,counts,colour\n',
			3,
			/unknown column 'colour'/,
			1,
			5
		],
		['missing column', 'basis,outcome_a,counts\n0,0,1\n', 3, /lacks column\(s\) outcome_b/, 1],
		[
			'non-integer counts',
			`${header}\n0,0,0,1.5\n`,
			3,
			/non-negative whole number, got '1.5'/,
			2,
			4
		],
		['negative counts', `${header}\n0,0,0,-3\n`, 3, /got '-3'/, 2, 4],
		['NaN counts', `# c\n${header}\n0,0,0,NaN\n`, 3, /got 'NaN'/, 3, 4],
		['infinite counts', `${header}\n0,0,0,Infinity\n`, 3, /got 'Infinity'/, 2, 4],
		[
			'outcome outside 0..d−1',
			`${header}\n0,0,0,1\n0,3,0,1\n`,
			3,
			/outcome_a 3 is outside 0..2/,
			3,
			2
		],
		[
			'basis that does not exist for d',
			`${header}\n2,0,0,1\n`,
			6,
			/basis 2 does not exist in dimension 6/,
			2,
			1
		],
		[
			'duplicate cell',
			`${header}\n0,1,1,5\n0,0,0,1\n0,1,1,6\n`,
			3,
			/duplicate cell .*first on line 2/,
			4
		],
		['wrong field count', `${header}\n0,1,1\n`, 3, /expected 4 fields, found 3/, 2],
		['header only', `${header}\n`, 3, /no data rows/],
		['empty file', '  \n\n', 3, /empty/],
		['comments only', '# nothing\n', 3, /no header/]
	];
	for (const [name, text, d, message, line, column] of cases) {
		it(`rejects ${name}, naming the line`, () => {
			const error = errorOf(() => parseCounts(text, d));
			expect(error.message).toMatch(message);
			expect(error.line).toBe(line);
			if (column !== undefined) expect(error.column).toBe(column);
			if (line !== undefined) expect(error.message).toMatch(new RegExp(`^line ${line}`));
		});
	}

	it('rejects absurd dimensions', () => {
		expect(errorOf(() => parseCounts(fullCsv(2, [0]), 1)).message).toMatch(
			/dimension must be a whole number from 2 to 1024/
		);
		expect(errorOf(() => parseCounts(fullCsv(2, [0]), 1025)).message).toMatch(/from 2 to 1024/);
	});

	it('rejects files over the size limit and invalid UTF-8', () => {
		const big = new Uint8Array(MAX_COUNTS_FILE_BYTES + 1).fill(0x30);
		expect(errorOf(() => parseCounts(big, 3)).message).toMatch(/limit is 20971520 bytes/);
		expect(errorOf(() => parseCounts(new Uint8Array([0x62, 0xff, 0xfe]), 3)).message).toMatch(
			/not valid UTF-8/
		);
	});

	it('rejects an incomplete table when the method needs every cell, naming the cell', () => {
		const text = fullCsv(3, [0, 1]).replace('\n1,2,1,1\n', '\n');
		const error = errorOf(() => certify(parseCounts(text, 3), { method: 'steering-2mub' }));
		expect(error.message).toMatch(/basis 1 is incomplete: no row for outcome_a=2, outcome_b=1/);
	});

	it('rejects bases the method cannot use or the file lacks', () => {
		const data = parseCounts(fullCsv(5, [0, 1, 2]), 5);
		expect(
			errorOf(() => certify(data, { method: 'steering-2mub', bases: [0, 1, 2] })).message
		).toMatch(/exactly 2/);
		expect(
			errorOf(() => certify(data, { method: 'fidelity-two-basis', bases: [0, 2] })).message
		).toMatch(/bases 0,1/);
		expect(
			errorOf(() => certify(data, { method: 'mub-correlation', bases: [0, 3] })).message
		).toMatch(/does not contain/);
		expect(errorOf(() => certify(data, { method: 'nonsense' })).message).toMatch(
			/method must be one of/
		);
		expect(errorOf(() => certify(data, { method: 'mub-correlation', claim: 6 })).message).toMatch(
			/claim must be/
		);
		expect(errorOf(() => certify(data, { method: 'mub-correlation', seed: 0 })).message).toMatch(
			/seed/
		);
	});
});

describe('counts JSON (product.md format)', () => {
	const good = {
		dimension: 2,
		tables: [
			{
				basis: 0,
				counts: [
					[9, 1],
					[2, 8]
				]
			}
		]
	};

	it('reads the JSON form', () => {
		const data = parseCounts(JSON.stringify(good), 2);
		expect([...data.tables[0].counts]).toEqual([9, 1, 2, 8]);
	});

	it('rejects a dimension different from the one requested', () => {
		expect(errorOf(() => parseCounts(JSON.stringify(good), 3)).message).toMatch(
			/the file says 2 but dimension 3/
		);
	});

	it('names the JSON path, line and column of a bad value', () => {
		const text =
			'{\n  "dimension": 2,\n  "tables": [\n    { "basis": 0, "counts": [[9, 1], [2, -8]] }\n  ]\n}';
		const error = errorOf(() => parseCounts(text, 2));
		expect(error.message).toMatch(
			/\$\.tables\[0\]\.counts\[1\]\[1\]: expected a non-negative whole number, got -8/
		);
		expect(error.line).toBe(4);
	});

	it('reports JSON syntax errors with a line', () => {
		const error = errorOf(() => parseCounts('{\n "dimension": 2,\n "tables": [,]\n}', 2));
		expect(error.message).toMatch(/not valid JSON/);
		expect(error.line).toBe(3);
	});

	it('rejects wrong shapes, unknown fields and duplicate bases', () => {
		const shape = {
			dimension: 2,
			tables: [
				{
					basis: 0,
					counts: [
						[1, 2, 3],
						[4, 5]
					]
				}
			]
		};
		expect(errorOf(() => parseCounts(JSON.stringify(shape), 2)).message).toMatch(
			/counts\[0\]: expected 2 entries/
		);
		const extra = { ...good, colour: 'red' };
		expect(errorOf(() => parseCounts(JSON.stringify(extra), 2)).message).toMatch(
			/\$\.colour: unknown field/
		);
		const twice = { dimension: 2, tables: [good.tables[0], good.tables[0]] };
		expect(errorOf(() => parseCounts(JSON.stringify(twice), 2)).message).toMatch(
			/basis 0 appears twice/
		);
		const fractional = {
			dimension: 2,
			tables: [
				{
					basis: 0,
					counts: [
						[1.5, 1],
						[1, 1]
					]
				}
			]
		};
		expect(errorOf(() => parseCounts(JSON.stringify(fractional), 2)).message).toMatch(/got 1.5/);
	});
});

describe('accidental subtraction (witnesses.md §3)', () => {
	// Common practice in photonics; the default certificate uses the raw counts.
	const rows = ['basis,outcome_a,outcome_b,counts,accidentals'];
	for (const t of [0, 1])
		for (let a = 0; a < 3; a++)
			for (let b = 0; b < 3; b++)
				rows.push(`${t},${a},${b},${a === b ? 1000 : 60},${a === b ? 10 : 40}`);
	const data = parseCounts(rows.join('\n'), 3);

	it('is off by default: raw counts, no label', () => {
		const raw = certify(data, { method: 'steering-2mub', resamples: 500 });
		expect(raw.backgroundSubtracted).toBe(false);
		expect(raw.statistic.value).toBeCloseTo(2 * (3000 / (3000 + 360)), 12);
	});

	it('subtracts the estimates cell by cell when asked, and says so on the result', () => {
		const subtracted = certify(data, {
			method: 'steering-2mub',
			// Per-cell draws need at least ⌈2/α⌉ = 1 482 resamples at 0.99865 (engine 3.0.0).
			resamples: 2000,
			subtractAccidentals: true
		});
		expect(subtracted.backgroundSubtracted).toBe(true);
		expect(subtracted.resampling).toBe('per-cell');
		expect(subtracted.warnings.join(' ')).toMatch(/Background-subtracted/);
		expect(subtracted.statistic.value).toBeCloseTo(2 * (2970 / (2970 + 120)), 12);
	});

	it('refuses to subtract when the file has no accidentals column', () => {
		const plain = parseCounts(fullCsv(3, [0, 1]), 3);
		expect(
			errorOf(() => certify(plain, { method: 'steering-2mub', subtractAccidentals: true })).message
		).toMatch(/accidentals column/);
	});
});
