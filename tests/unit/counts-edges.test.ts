/**
 * Hostile and odd counts files (issue 7 §4): nesting that overflows a recursive parser, and the
 * one rule for writing a count in CSV and JSON alike — digits only.
 */
import { describe, expect, it } from 'vitest';
import { InputError, parseCounts } from '../../src/lib/certify';
import { MAX_JSON_DEPTH } from '../../src/lib/certify/json-guards';

function errorOf(run: () => unknown): InputError {
	try {
		run();
	} catch (error) {
		expect(error).toBeInstanceOf(InputError);
		return error as InputError;
	}
	throw new Error('expected an InputError');
}

/** A d = 2 JSON file, one basis, with the count of cell (0, 1) written as given. */
const jsonWith = (written: string, extra = '') =>
	`{"dimension": 2, "tables": [{"basis": 0, "counts": [[10, ${written}], [3, 12]]${extra}}]}`;
const csvWith = (written: string) =>
	`basis,outcome_a,outcome_b,counts\n0,0,0,10\n0,0,1,${written}\n0,1,0,3\n0,1,1,12\n`;

describe('JSON nesting', () => {
	it('refuses 100 000 nested arrays with an InputError at the first level too deep', () => {
		// Recursive descent uses one stack frame per level; V8's default stack holds ~10⁴ (from memory).
		const deep = '{"dimension": 2, "tables": ' + '['.repeat(100_000) + ']'.repeat(100_000) + '}';
		const problem = errorOf(() => parseCounts(deep, 2));
		expect(problem.message).toMatch(/nests deeper than/);
		expect(problem.line).toBe(1);
		// Column of the bracket that opens level MAX_JSON_DEPTH + 1 (the root object is level 1).
		expect(problem.column).toBe('{"dimension": 2, "tables": '.length + MAX_JSON_DEPTH);
	});

	it('refuses deep objects as well as arrays, and accepts the five levels the form needs', () => {
		const deep = '{"a":'.repeat(50_000) + '1' + '}'.repeat(50_000);
		expect(errorOf(() => parseCounts(deep, 2)).message).toMatch(/nests deeper/);
		expect(parseCounts(jsonWith('0'), 2).tables[0].counts[1]).toBe(0);
	});
});

describe('one way to write a count in CSV and JSON', () => {
	// RFC 8259 §6: a JSON number may carry a sign, a fraction and an exponent, so 1e3, 1000.0,
	// -0 and 1e-400 (which underflows to 0 in IEEE 754 binary64) are all valid JSON numbers.
	// A count is a tally: like the CSV form, the JSON form takes digits only.
	for (const written of ['1e3', '1000.0', '-0', '1e-400', '1E3', '0.5']) {
		it(`refuses ${written} in both forms, naming the place`, () => {
			const json = errorOf(() => parseCounts(jsonWith(written), 2));
			expect(json.message).toContain('$.tables[0].counts[0][1]');
			expect(json.message).toContain(written);
			expect(json.line).toBe(1);
			expect(json.column).toBe(jsonWith(written).indexOf(written) + 1);
			const csv = errorOf(() => parseCounts(csvWith(written), 2));
			expect(csv.line).toBe(3);
		});
	}

	it('accepts digits in both forms and reads the same tables', () => {
		const fromJson = parseCounts(jsonWith('1000'), 2).tables[0].counts;
		const fromCsv = parseCounts(csvWith('1000'), 2).tables[0].counts;
		expect([...fromJson]).toEqual([10, 1000, 3, 12]);
		expect([...fromCsv]).toEqual([...fromJson]);
	});

	it('refuses a basis or dimension written other than with digits', () => {
		const basis = errorOf(() =>
			parseCounts(jsonWith('1').replace('"basis": 0', '"basis": 0.0'), 2)
		);
		expect(basis.message).toContain('$.tables[0].basis');
		const dimension = errorOf(() =>
			parseCounts(jsonWith('1').replace('"dimension": 2', '"dimension": 2e0'), 2)
		);
		expect(dimension.message).toContain('$.dimension');
	});

	it('refuses -0 among the accidentals but keeps decimals there', () => {
		const acc = (written: string) => jsonWith('1', `, "accidentals": [[0.5, ${written}], [0, 0]]`);
		expect(errorOf(() => parseCounts(acc('-0'), 2)).message).toContain(
			'$.tables[0].accidentals[0][1]'
		);
		expect(parseCounts(acc('0.25'), 2).tables[0].accidentals![1]).toBe(0.25);
	});
});
