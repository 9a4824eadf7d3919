/**
 * Data no quantum state could give (docs/statistics.md). For two mutually unbiased bases s, t a
 * trusted side's outcome probabilities obey P_s(j) + P_t(k) ≤ 1 + 1/√d (the largest eigenvalue
 * of the sum of two rank-one projectors with overlap 1/d; the min-entropy partner of Maassen &
 * Uffink, Phys. Rev. Lett. 60, 1103 (1988)). Data are refused when exact lower limits of two
 * marginals already exceed it; a real state is refused with probability below REFUSAL_ERROR.
 */
import { InputError, type CountTable } from './counts';
import { clopperPearsonLower } from './exact-limits';

export const REFUSAL_ERROR = 1e-6;

export type Side = 'A' | 'B';

export interface EntropicSum {
	side: Side;
	bases: [number, number];
	/** Plug-in H(X_s) + H(X_t) in bits; Maassen–Uffink: at least log₂ d for any state. */
	bits: number;
	log2Dimension: number;
}

function marginal(table: CountTable, d: number, side: Side): Float64Array {
	const m = new Float64Array(d);
	for (let a = 0; a < d; a++)
		for (let b = 0; b < d; b++) m[side === 'A' ? a : b] += table.counts[a * d + b];
	return m;
}

function entropyBits(counts: Float64Array): number {
	const total = counts.reduce((s, c) => s + c, 0);
	let h = 0;
	for (const c of counts) if (c > 0) h -= (c / total) * Math.log2(c / total);
	return h;
}

/** Throws an InputError naming side, bases and outcomes; returns the smallest entropy sum per side. */
/** The largest P_s(j) + P_t(k) any state gives, for tables i, k and outcomes j, l: 1 + |⟨j_s|l_t⟩|. */
export type PairLimit = (i: number, k: number, j: number, l: number) => number;

export function checkQuantumMarginals(
	tables: CountTable[],
	d: number,
	sides: Side[],
	pairLimit?: PairLimit
): EntropicSum[] {
	const alpha = REFUSAL_ERROR / (sides.length * tables.length * d);
	const unbiased = 1 + 1 / Math.sqrt(d);
	const out: EntropicSum[] = [];
	for (const side of sides) {
		const marginals = tables.map((t) => marginal(t, d, side));
		const best = marginals.map((m) => {
			const total = m.reduce((s, c) => s + c, 0);
			const j = m.indexOf(Math.max(...m));
			return { outcome: j, lower: clopperPearsonLower(m[j], total, alpha) };
		});
		let smallest: EntropicSum | null = null;
		for (let i = 0; i < tables.length; i++) {
			for (let k = i + 1; k < tables.length; k++) {
				const [s, t] = [tables[i].basis, tables[k].basis];
				const limit = pairLimit ? pairLimit(i, k, best[i].outcome, best[k].outcome) : unbiased;
				if (best[i].lower + best[k].lower > limit) {
					const what = pairLimit
						? `these calibrated bases (their lower limits add to ${(best[i].lower + best[k].lower).toFixed(4)}, above 1 + |⟨j|k⟩| = ${limit.toFixed(4)})`
						: `these unbiased bases (their lower limits add to ${(best[i].lower + best[k].lower).toFixed(4)}, above 1 + 1/√${d} = ${limit.toFixed(4)})`;
					throw new InputError(
						`side ${side}: outcome ${best[i].outcome} in basis ${s} and outcome ${best[k].outcome} in basis ${t} ` +
							`are too frequent for any quantum state measured in ${what}; ` +
							`check the basis labels and the outcome order`
					);
				}
				const bits = entropyBits(marginals[i]) + entropyBits(marginals[k]);
				if (!smallest || bits < smallest.bits)
					smallest = { side, bases: [s, t], bits, log2Dimension: Math.log2(d) };
			}
		}
		if (smallest) out.push(smallest);
	}
	return out;
}
