/**
 * Malformed counts files for the hostile-input tests, as fast-check arbitraries: each one starts
 * from a good d = 5 file (bases 0, 1, 2; what the tests' claims ask for) and breaks it in one way
 * that no reading of the counts format (docs/product.md, counts-csv.ts, counts-json.ts) accepts.
 */
import fc from 'fast-check';
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';

export const D = 5;
export const BASES = [0, 1, 2];
const counts = sampledCounts(states.isotropic(D, 0.9), BASES, 40_000, 41);
export const GOOD_CSV = toCountsCsv(counts, ['hostile-input base file']);

const csvLines = GOOD_CSV.split('\n');
const header = csvLines.findIndex((line) => line.startsWith('basis'));
const dataLines = csvLines.length - header - 2;
const encode = (text: string) => new TextEncoder().encode(text);
const joinBytes = (...parts: Uint8Array[]) => new Uint8Array(Buffer.concat(parts));

export interface Hostile {
	kind: string;
	bytes: Uint8Array;
}

/** A good CSV with data line `i` (0-based among the data rows) replaced by `make(fields)`. */
function withRow(i: number, make: (fields: string[]) => string): string {
	const lines = [...csvLines];
	const at = header + 1 + (i % dataLines);
	lines[at] = make(lines[at].split(','));
	return lines.join('\n');
}

const badNumber = fc.constantFrom(
	...['-5', '3.5', '1e3', '0x10', '', ' ', 'NaN', 'Infinity', '"12"', '١٢', '+4', '12abc'],
	...['99999999999999999999999', '9007199254740993', '1,5', '٣', '¼', '−3', 'null', '0.0']
);
const row = fc.nat({ max: 10_000 });
const column = fc.nat({ max: 3 });

const csvCases: fc.Arbitrary<Hostile>[] = [
	fc.tuple(row, column, badNumber).map(([i, c, bad]) => ({
		kind: 'bad number',
		bytes: encode(withRow(i, (f) => f.map((v, k) => (k === c ? bad : v)).join(',')))
	})),
	fc.tuple(row, fc.constantFrom(D, D + 1, 1000)).map(([i, outcome]) => ({
		kind: 'outcome out of range',
		bytes: encode(withRow(i, (f) => [f[0], String(outcome), f[2], f[3]].join(',')))
	})),
	fc.tuple(row, fc.integer({ min: 1, max: 5 })).map(([i, extra]) => ({
		kind: 'wrong field count',
		bytes: encode(withRow(i, (f) => [...f, ...Array(extra).fill('7')].join(',')))
	})),
	row.map((i) => ({
		kind: 'missing field',
		bytes: encode(withRow(i, (f) => f.slice(0, 3).join(',')))
	})),
	row.map((i) => ({
		kind: 'unbalanced quote',
		bytes: encode(withRow(i, (f) => `"${f.join(',')}`))
	})),
	row.map((i) => ({
		kind: 'duplicate cell',
		bytes: encode(withRow(i, (f) => `${f.join(',')}\n${f.slice(0, 3).join(',')},1`))
	})),
	fc
		.constantFrom(
			...['basis,outcome_a,counts', 'basis,outcome_a,outcome_b,counts,counts', 'Basis;a;b;n'],
			...['basis,outcome_a,outcome_b,count', '"basis",outcome_a,outcome_b,counts,extra', '']
		)
		.map((bad) => ({
			kind: 'bad header',
			bytes: encode(csvLines.map((line, i) => (i === header ? bad : line)).join('\n'))
		})),
	fc.tuple(row, fc.uint8Array({ minLength: 1, maxLength: 64 })).map(([i, junk]) => ({
		kind: 'binary junk',
		bytes: joinBytes(encode(withRow(i, (f) => f.join(',') + '\n')), Uint8Array.of(0), junk)
	})),
	fc
		.tuple(row, fc.constantFrom([0xff], [0xc3, 0x28], [0xe2, 0x82], [0xed, 0xa0, 0x80]))
		.map(([i, bad]) => {
			const text = withRow(i, (f) => f.join(',') + '\u0001');
			const cut = text.indexOf('\u0001');
			const bytes = joinBytes(
				encode(text.slice(0, cut)),
				Uint8Array.from(bad),
				encode(text.slice(cut + 1))
			);
			return { kind: 'invalid UTF-8', bytes };
		}),
	fc.tuple(row, fc.integer({ min: 20, max: 200_000 })).map(([i, length]) => ({
		kind: 'over-long line',
		bytes: encode(withRow(i, (f) => [f[0], f[1], f[2], '9'.repeat(length)].join(',')))
	})),
	fc.uint8Array({ minLength: 0, maxLength: 400 }).map((bytes) => ({ kind: 'random bytes', bytes })),
	fc
		.constantFrom('', '\n\n', '# only a comment\n', csvLines.slice(0, header + 1).join('\n'))
		.map((text) => ({ kind: 'no data', bytes: encode(text) }))
];

const goodJson = () => ({
	dimension: D,
	tables: BASES.map((basis) => ({
		basis,
		counts: Array.from({ length: D }, (_, a) =>
			Array.from({ length: D }, (_, b) => (a === b ? 900 : 30))
		)
	}))
});
type JsonFile = ReturnType<typeof goodJson> & Record<string, unknown>;
const jsonCase = (kind: string, change: (file: JsonFile) => unknown) =>
	fc.constant(null).map(() => ({ kind, bytes: encode(JSON.stringify(change(goodJson()))) }));
const badValue = fc.constantFrom<unknown>(-1, 2.5, 1e300, '12', null, true, [1], { n: 1 });

const jsonCases: fc.Arbitrary<Hostile>[] = [
	fc
		.tuple(fc.nat({ max: 2 }), fc.nat({ max: D - 1 }), fc.nat({ max: D - 1 }), badValue)
		.map(([t, a, b, bad]) => {
			const file = goodJson() as JsonFile;
			(file.tables[t].counts[a] as unknown[])[b] = bad;
			return { kind: 'json bad count', bytes: encode(JSON.stringify(file)) };
		}),
	fc.integer({ min: 33, max: 100_000 }).map((depth) => ({
		kind: 'json too deep',
		bytes: encode('{"dimension":5,"tables":' + '['.repeat(depth) + ']'.repeat(depth) + '}')
	})),
	jsonCase('json missing dimension', ({ tables }) => ({ tables })),
	jsonCase('json missing tables', ({ dimension }) => ({ dimension })),
	jsonCase('json wrong dimension', (f) => ({ ...f, dimension: 4 })),
	jsonCase('json unknown field', (f) => ({ ...f, extra: 1 })),
	jsonCase('json short row', (f) => (f.tables[0].counts[1].pop(), f)),
	jsonCase('json duplicate basis', (f) => ({ ...f, tables: [...f.tables, f.tables[0]] })),
	jsonCase('json not an object', (f) => [f]),
	fc.nat({ max: JSON.stringify(goodJson()).length - 2 }).map((cut) => ({
		kind: 'json truncated',
		bytes: encode(JSON.stringify(goodJson()).slice(0, 1 + cut))
	}))
];

/** Every kind above, equally likely across CSV and JSON. */
export const hostileCounts: fc.Arbitrary<Hostile> = fc.oneof(
	fc.oneof(...csvCases),
	fc.oneof(...jsonCases)
);

/** The message must say where: a line (and column or JSON path), or that the whole file is wrong. */
export const NAMES_THE_PLACE = /^line \d+(, column \d+)?: \S|^the (file|JSON) \S/;
