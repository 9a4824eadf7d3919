/**
 * The whole result of the time-ordered check, pinned (issue 20's speed-up): the expected results
 * in tests/fixtures/trials-pinned-results.json were written by the engine as it stood before the
 * faster parser and bet loop (main at e9a6a5b), so every p-value, trace point, ladder, settings
 * check and i.i.d. comparison must come out bit for bit the same, however the bytes are cut.
 * JSON keeps every finite double exactly (shortest round-trip form, ECMA-262 Number::toString).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ENGINE_VERSION } from '../../src/lib/certify';
import { certifyTrials, parseTrials, TrialsParser } from '../../src/lib/certify/trials';
import { pinnedCases, type PinnedCase } from '../trials-pinned-cases';

/** The version moves with any engine change (the i.i.d. comparison carries one too); nothing else. */
function atEngineVersion(x: unknown): unknown {
	if (Array.isArray(x)) return x.map(atEngineVersion);
	if (x === null || typeof x !== 'object') return x;
	const out = Object.fromEntries(Object.entries(x).map(([k, v]) => [k, atEngineVersion(v)]));
	if (out.engine && typeof out.engine === 'object' && 'version' in out.engine)
		out.engine = { ...out.engine, version: ENGINE_VERSION };
	return out;
}

const expected = atEngineVersion(
	JSON.parse(readFileSync('tests/fixtures/trials-pinned-results.json', 'utf8'))
) as Record<string, unknown>;

function resultOf(c: PinnedCase, chunk: number): unknown {
	const bytes = new TextEncoder().encode(c.csv);
	const parser = new TrialsParser(c.dimension, c.mode);
	for (let i = 0; i < bytes.length; i += chunk) parser.push(bytes.subarray(i, i + chunk));
	const result = certifyTrials(parser.finish(), c.options);
	return JSON.parse(JSON.stringify(result));
}

describe('the time-ordered check, pinned to the engine before the speed-up', () => {
	for (const c of pinnedCases()) {
		const pinned = expected[c.name];
		it(`${c.name}: the same result, read in 1 MiB chunks and in 4099-byte chunks`, () => {
			expect(resultOf(c, 1 << 20)).toEqual(pinned);
			expect(resultOf(c, 4099)).toEqual(pinned);
		});
	}

	it('the same result when the bytes arrive a few at a time (every cut of a line)', () => {
		const c = pinnedCases().find((p) => p.name === 'd7-short-run')!;
		const pinned = expected[c.name];
		for (const chunk of [1, 2, 3, 5, 11]) expect(resultOf(c, chunk)).toEqual(pinned);
	});
});

describe('bad rows among plain ones: the same error as before the fast path', () => {
	// Messages as the parser gave them before the speed-up (main at e9a6a5b); d = 3.
	const head = 'basis,outcome_a,outcome_b\n0,1,1\n1,2,2\n';
	const cases: [string, string][] = [
		[head + '0,3,1\n0,1,1\n', 'line 4, column 2: outcome_a must be 0..2, got 3'],
		[head + '0,1,x\n', "line 4, column 3: outcome_b must be a whole number, got 'x'"],
		[head + '0,1\n', 'line 4, column 3: expected 3 fields, got 2'],
		[head + '0,1,2,2\n', 'line 4, column 4: expected 3 fields, got 4'],
		[head + '0,1,,\n', 'line 4, column 4: expected 3 fields, got 4'],
		[
			head + '0,00000000000001,1\n',
			"line 4, column 2: outcome_a must be a whole number, got '00000000000001'"
		],
		[
			'outcome_b,basis,outcome_a\n0,1,1\n1,2,2\n2,9,0\n',
			'line 4, column 2: basis: basis 9 does not exist in dimension 3 (0 and 1 exist in every dimension; 2..3 only when 3 is a prime power)'
		]
	];
	for (const [text, message] of cases)
		it(message, () => {
			expect(() => parseTrials(new TextEncoder().encode(text), 3, 'trials')).toThrow(message);
		});

	it('a 13-digit field is still a number; a basis first seen mid-file is still checked', () => {
		const data = parseTrials(
			new TextEncoder().encode(head + '1,0000000000001,1\n2,0,0\n'),
			3,
			'trials'
		);
		expect(Array.from(data.codes)).toEqual([1, 3, 3, 5]);
	});
});
