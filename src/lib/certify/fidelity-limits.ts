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

export function fidelityCellLimits(
	tables: CountTable[],
	d: number,
	alpha: number,
	statistic: FidelityStatistic
): number {
	const [computational, fourier] = tables;
	const t0 = totals(computational, d);
	const t1 = totals(fourier, d);
	const cellAlpha = alpha / (3 * d * (d - 1));
	const upper = new Map<number, number>();
	const p0 = new Float64Array(d * d);
	for (let c = 0; c < d * d; c++) {
		if (c % (d + 1) === 0) continue;
		const n = computational.counts[c];
		if (!upper.has(n)) upper.set(n, clopperPearsonUpper(n, t0.total, cellAlpha));
		p0[c] = upper.get(n)!;
	}
	// Only the diagonal sum enters F̃, so the whole lower limit sits in cell (0, 0).
	p0[0] = clopperPearsonLower(t0.diagonal, t0.total, alpha / 3);
	const p1 = new Float64Array(d * d);
	p1[0] = clopperPearsonLower(t1.diagonal, t1.total, alpha / 3);
	return statistic([p0, p1]);
}
