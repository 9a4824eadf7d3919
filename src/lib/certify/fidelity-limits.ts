/**
 * The cell-limit lower bound of the fidelity method (docs/statistics.md): on the joint event
 * that P_0 ≥ L(P_0), P_1 ≥ L(P_1) and every off-diagonal computational cell p_c ≤ u_c, which
 * has probability ≥ 1 − α by the union bound, F̃ ≥ (1/d)[L(P_0) + d·L(P_1) − 1 − Γ(u)],
 * because Γ grows with every p_c. Error split: α/3 for each fraction, α/(3·d(d − 1)) per cell.
 * Exact Clopper–Pearson limits, so it needs raw counts (not rates or subtracted data).
 */
import type { CountTable } from './counts';
import { clopperPearsonLower, clopperPearsonUpper } from './exact-limits';

/** F̃ evaluated by the witness family on (possibly unnormalised) tables. */
export type FidelityStatistic = (p: Float64Array[]) => number;

function totals(table: CountTable, d: number): { diagonal: number; total: number } {
	let diagonal = 0;
	let total = 0;
	for (let c = 0; c < d * d; c++) total += table.counts[c];
	for (let a = 0; a < d; a++) diagonal += table.counts[a * d + a];
	return { diagonal, total };
}

interface CellCounts {
	/** Matches and total of the computational basis, then of the Fourier basis. */
	diagonal0: number;
	total0: number;
	diagonal1: number;
	total1: number;
	/** Count of off-diagonal computational cell c (cells on the diagonal are not read). */
	offDiagonal: (c: number) => number;
}

function cellLimits(n: CellCounts, d: number, alpha: number, statistic: FidelityStatistic): number {
	const cellAlpha = alpha / (3 * d * (d - 1));
	const upper = new Map<number, number>();
	const p0 = new Float64Array(d * d);
	for (let c = 0; c < d * d; c++) {
		if (c % (d + 1) === 0) continue;
		const count = n.offDiagonal(c);
		if (!upper.has(count)) upper.set(count, clopperPearsonUpper(count, n.total0, cellAlpha));
		p0[c] = upper.get(count)!;
	}
	// Only the diagonal sum enters F̃, so the whole lower limit sits in cell (0, 0).
	p0[0] = clopperPearsonLower(n.diagonal0, n.total0, alpha / 3);
	const p1 = new Float64Array(d * d);
	p1[0] = clopperPearsonLower(n.diagonal1, n.total1, alpha / 3);
	return statistic([p0, p1]);
}

export function fidelityCellLimits(
	tables: CountTable[],
	d: number,
	alpha: number,
	statistic: FidelityStatistic
): number {
	const [computational, fourier] = tables;
	const t0 = totals(computational, d);
	const t1 = totals(fourier, d);
	return cellLimits(
		{
			diagonal0: t0.diagonal,
			total0: t0.total,
			diagonal1: t1.diagonal,
			total1: t1.total,
			offDiagonal: (c) => computational.counts[c]
		},
		d,
		alpha,
		statistic
	);
}

/**
 * The largest value the cell limits can take at these totals, whatever the counts: every count on
 * the diagonal. L(P₀) and L(P₁) grow with the matches, each u_c with its count, and F̃ falls as
 * any u_c grows (Γ is increasing in every cell), so no table with these totals gives more.
 */
export function fidelityCellCeiling(
	tables: CountTable[],
	d: number,
	alpha: number,
	statistic: FidelityStatistic
): number {
	const total0 = totals(tables[0], d).total;
	const total1 = totals(tables[1], d).total;
	return cellLimits(
		{ diagonal0: total0, total0, diagonal1: total1, total1, offDiagonal: () => 0 },
		d,
		alpha,
		statistic
	);
}
