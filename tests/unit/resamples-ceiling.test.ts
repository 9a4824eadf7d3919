/**
 * The resamples ceiling that scales with the work of per-cell draws (rates, subtracted
 * accidentals): cells read (d² per basis) × resamples stays within one budget, checked the same
 * way by the engine and by the check request schema. Raw counts have none (engine 3.0.0: their
 * bounds are convolved per basis, no cells are drawn).
 * Cell counts: a d × d coincidence table per measured basis pair (common practice).
 */
import { describe, expect, it } from 'vitest';
import {
	availableBases,
	CELL_RESAMPLES_BUDGET,
	certify,
	InputError,
	MAX_COUNTS_FILE_BYTES,
	MAX_DIMENSION,
	RESAMPLES,
	resamplesCeiling,
	sampledCounts,
	states
} from '../../src/lib/certify';
import { checkRequestSchemaFor } from '../../src/lib/claims/schema';

describe('resamplesCeiling', () => {
	it('is the budget divided by d² × bases, rounded down, within the absolute limits', () => {
		expect(CELL_RESAMPLES_BUDGET).toBe(2e9);
		// d = 64, two bases: 2·10⁹ / 8 192 = 244 140.6…
		expect(resamplesCeiling(64, 2)).toBe(244_140);
		// d = 127, two bases: 2·10⁹ / 32 258 = 62 000.1…
		expect(resamplesCeiling(127, 2)).toBe(62_000);
		// d = 31, two bases: 1 922 cells allow more than the absolute 10⁶.
		expect(resamplesCeiling(31, 2)).toBe(RESAMPLES.max);
	});

	it('leaves every claim the service accepts at least the smallest check', () => {
		for (let d = 2; d <= MAX_DIMENSION; d++) {
			const bases = Math.max(availableBases(d, 'cyclic').length, availableBases(d, 'field').length);
			const ceiling = resamplesCeiling(d, bases);
			expect(ceiling).toBeGreaterThanOrEqual(RESAMPLES.min);
			expect(ceiling).toBeLessThanOrEqual(RESAMPLES.max);
			// Without the floor at the minimum the budget itself keeps ≥ 100 (d = 256: 118), except where the
			// complete tables of every basis cannot fit in a counts file anyway (at least 2 bytes a cell, "0," in JSON).
			const byBudget = Math.floor(CELL_RESAMPLES_BUDGET / (d * d * bases));
			expect(byBudget >= 100 || d * d * bases * 2 > MAX_COUNTS_FILE_BYTES, `d = ${d}`).toBe(true);
		}
	});
});

describe('one limit in the engine and the schema', () => {
	const d = 64;
	const dataset = sampledCounts(states.isotropic(d, 0.9), [0, 1], 200_000, 5);
	const subtracted = {
		...dataset,
		tables: dataset.tables.map((t) => ({ ...t, accidentals: new Float64Array(d * d).fill(1) }))
	};

	it('the engine refuses one resample over the ceiling per cell, naming resamples and the ceiling', () => {
		const run = () =>
			certify(subtracted, {
				method: 'fidelity-two-basis',
				bases: [0, 1],
				resamples: 244_141,
				subtractAccidentals: true
			});
		expect(run).toThrow(InputError);
		expect(run).toThrow(/resamples must be at most 244,140 for d = 64 on 2 bases/);
	});

	it('raw counts have no cells × resamples ceiling: their bound does not draw cells', () => {
		const r = certify(dataset, { method: 'fidelity-two-basis', bases: [0, 1], resamples: 244_141 });
		expect(r.resamples).toBe(244_141);
		const schema = checkRequestSchemaFor({ dimension: d, bases: [0, 1] });
		expect(schema.safeParse({ resamples: '244141' }).success).toBe(true);
	});

	it('the schema refuses the same number with accidentals subtracted and accepts the ceiling', () => {
		const schema = checkRequestSchemaFor({ dimension: d, bases: [0, 1] });
		const refused = schema.safeParse({ resamples: '244141', subtractAccidentals: 'on' });
		expect(refused.success).toBe(false);
		expect(refused.error!.issues[0].path).toEqual(['resamples']);
		expect(refused.error!.issues[0].message).toMatch(/at most 244,140/);
		expect(schema.safeParse({ resamples: 244_140, subtractAccidentals: 'on' }).success).toBe(true);
		// The absolute limits stay: 10⁶ + 1 is refused even for a small table.
		const small = checkRequestSchemaFor({ dimension: 3, bases: [0, 1] });
		expect(small.safeParse({ resamples: RESAMPLES.max + 1 }).success).toBe(false);
	});
});
