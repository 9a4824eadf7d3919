/**
 * The per-cell Poisson model: every cell of every used table is its own variable. It serves
 * files with integration times (rates R = N/τ, witnesses.md §3) or accidental subtraction,
 * where the sufficient totals of §6 no longer apply, and the benchmark's naive reference.
 */
import type { CountTable } from './counts';
import type { PoissonModel } from './model';

export interface CellModelOptions {
	subtractAccidentals: boolean;
}

export function perCellModel(
	tables: CountTable[],
	d: number,
	statistic: (p: Float64Array[]) => number,
	options: CellModelOptions
): PoissonModel {
	const cells = d * d;
	const means = new Float64Array(cells * tables.length);
	tables.forEach((table, i) => means.set(table.counts, i * cells));
	const probabilities = tables.map(() => new Float64Array(cells));
	return {
		means,
		statistic(x) {
			tables.forEach((table, i) => {
				const p = probabilities[i];
				let total = 0;
				for (let c = 0; c < cells; c++) {
					let w = x[i * cells + c];
					if (options.subtractAccidentals && table.accidentals)
						w = Math.max(0, w - table.accidentals[c]);
					if (table.durations) w /= table.durations[c];
					p[c] = w;
					total += w;
				}
				for (let c = 0; c < cells; c++) p[c] = total > 0 ? p[c] / total : 0;
			});
			return statistic(probabilities);
		}
	};
}

/** True when the file's integration times differ within a table, so rates differ from counts. */
export function hasUnequalDurations(tables: CountTable[]): boolean {
	return tables.some((t) => t.durations !== null && t.durations.some((v) => v !== t.durations![0]));
}
