/**
 * Issue 16 part 2: counts files are read with bounded memory. A table is d² numbers however few
 * rows name it, so the readers take every table from a budget (MAX_TABLE_NUMBERS) before
 * building it and refuse, naming the line or field, a file whose tables would not fit; a row of
 * a million fields is refused by counting them, not by splitting it. Memory is shown through the
 * budget the parser reports, never by timing or measuring the process (that is npm run bench:load).
 */
import { describe, expect, it } from 'vitest';
import { InputError, parseCountsCsv, parseCountsJson } from '../../src/lib/certify';
import { MAX_TABLE_NUMBERS, TableBudget } from '../../src/lib/certify/counts-budget';

const HEADER = 'basis,outcome_a,outcome_b,counts';
const failure = (read: () => unknown) => {
	try {
		read();
	} catch (error) {
		return error as InputError;
	}
	return null;
};

describe('the table budget', () => {
	it('refuses the CSV row whose basis would take the tables past the budget, before building it', () => {
		// d = 256 = 2^8 has 257 bases; one row each asks for 257 tables of 65 536 cells.
		const d = 256;
		const fit = MAX_TABLE_NUMBERS / (d * d);
		const rows = Array.from({ length: d + 1 }, (_, basis) => `${basis},0,0,5`);
		const budget = new TableBudget();
		const error = failure(() => parseCountsCsv([HEADER, ...rows].join('\n'), d, budget));
		expect(error).toBeInstanceOf(InputError);
		// Line 1 is the header: the row of basis `fit` (the first that does not fit) is line fit + 2.
		expect(error!.line).toBe(fit + 2);
		expect(error!.message).toMatch(
			new RegExp(
				`^line ${fit + 2}: basis ${fit}: the file's tables would hold more than 8 388 608 numbers`
			)
		);
		expect(budget.taken).toBe(MAX_TABLE_NUMBERS);
	});

	it('counts accidentals and durations columns against the budget too', () => {
		const header = `${HEADER},accidentals,duration_s`;
		const rows = ['0,0,0,5,0.1,1', '1,0,0,5,0.1,1'];
		const budget = new TableBudget(3 * 25 + 1);
		const error = failure(() => parseCountsCsv([header, ...rows].join('\n'), 5, budget));
		expect(error?.message).toMatch(/^line 3: basis 1: the file's tables would hold more/);
		expect(budget.taken).toBe(75);
	});

	it('refuses the JSON matrix that would not fit, naming its path, line and column', () => {
		const matrix = JSON.stringify(Array.from({ length: 5 }, () => [1, 2, 3, 4, 5]));
		const tables = [0, 1, 2].map((basis) => `{"basis": ${basis}, "counts": ${matrix}}`);
		const text = `{"dimension": 5,\n"tables": [\n${tables.join(',\n')}]}`;
		const budget = new TableBudget(2 * 25);
		const error = failure(() => parseCountsJson(text, 5, budget));
		expect(error?.message).toMatch(
			/^line 5, column 24: \$\.tables\[2\]\.counts: the file's tables/
		);
		expect(budget.taken).toBe(50);
		// The same file with room for its three tables reads whole.
		expect(parseCountsJson(text, 5, new TableBudget(75)).tables).toHaveLength(3);
	});

	it('fits a complete d = 1 024 table eight times over (the dimension limit issue 19 raises to)', () => {
		const budget = new TableBudget();
		for (let i = 0; i < 8; i++) expect(budget.take(1024 * 1024)).toBe(true);
		expect(budget.take(1)).toBe(false);
	});
});

describe('long rows', () => {
	it('refuses a row of a million fields by counting them, naming the line', () => {
		const row = Array(1_000_000).fill('0').join(',');
		const error = failure(() => parseCountsCsv(`${HEADER}\n0,0,0,1\n${row}\n`, 5));
		expect(error?.message).toBe('line 3: expected 4 fields, found 1000000');
	});

	it('names the header fault among its first fields, however many follow', () => {
		const header = `${HEADER},${Array(100_000).fill('x').join(',')}`;
		const error = failure(() => parseCountsCsv(`${header}\n0,0,0,1\n`, 5));
		expect(error?.message).toMatch(/^line 1, column 5: unknown column 'x'/);
	});
});
