/**
 * The fidelity-target rows of `npm run coverage` (scripts/coverage-target.ts): same columns as the
 * witness rows; "miss" is the lower bound above the true F̃, "miss of F" above F(ρ, Φ_λ) itself.
 * Exact limits, no resampling: the resamples column does not apply.
 */
import { missAllowance } from './coverage-run';
import { runTargetCoverage, targetCases } from './coverage-target';

const pct = (x: number) => (100 * x).toFixed(2);

/** Prints the rows `range` ('2-4', or 'none') selects; returns how many settings were above nominal. */
export function targetRows(
	range: string,
	scale: number,
	settings: { confidence: number; experiments: number }[],
	countLevels: number[]
): number {
	if (range === 'none') return 0;
	const [first, last] = range.split('-').map(Number);
	let flagged = 0;
	for (const c of targetCases().slice(first, (last ?? first) + 1)) {
		for (const pairs of countLevels) {
			for (const s of settings) {
				const experiments = Math.max(10, Math.round(s.experiments * scale));
				const o = runTargetCoverage(c, { ...s, experiments, pairs, firstSeed: 1 });
				const q = 1 - s.confidence;
				const judged = experiments - o.refused;
				const se = Math.sqrt((q * (1 - q)) / judged);
				const over = [o.misses, o.falseCertificates, o.missesOfFidelity].some(
					(k) => k > missAllowance(q, judged)
				);
				if (over) flagged++;
				const sn = `${c.state.schmidtNumberIsBound ? '≤' : ''}${c.state.schmidtNumber}`;
				console.log(
					`| fidelity-target λ=(${c.target.join(', ')}) | ${c.state.label} (${sn}) | 0,1 | ${pairs} | ${s.confidence} | ${judged}${o.refused ? ` (+${o.refused} refused)` : ''} | ` +
						`${pct(o.misses / judged)} ± ${pct(se)} | ${pct(o.missesOfFidelity / judged)} | ` +
						`${pct(o.falseCertificates / judged)} | ${o.meanCertified.toFixed(3)} | ${over ? 'OVER' : ''} |`
				);
			}
		}
	}
	return flagged;
}
