/**
 * Coverage rows for `fidelity-target` (witnesses.md §4.3′, docs/statistics.md §10): states
 * ρ = v·|ψ_c⟩⟨ψ_c| + (1 − v)·𝟙/d² with ψ_c = Σ_m c_m |mm⟩, their exact computational table and
 * tilted-vector table (per computational pair, same integration time), repeated Poisson experiments
 * certified with the declared λ. The boundary states are the truncations of Φ_λ to its r largest
 * coefficients: Schmidt number r and F = Σ_{i≤r} λ_i² = B_r exactly.
 */
import { InputError } from '../src/lib/certify';
import {
	certifyTarget,
	targetCoefficients,
	targetPointValue
} from '../src/lib/certify/fidelity-target';
import { sampleTables, type TableState } from '../src/lib/certify/simulate-tables';
import { targetState, truncatedTarget } from '../src/lib/certify/fidelity-target/states';

export { targetState, truncatedTarget };

export interface TargetCase {
	/** λ as declared (scaled to Σλ² = 1 by the engine). */
	target: number[];
	state: TableState;
}

/** The true F̃: the statistic at the exact tables (it depends on them only through ratios). */
export function trueTargetValue(c: TargetCase): number {
	const d = c.state.dimension;
	const tilted = c.state.table(1);
	return targetPointValue(
		{
			computational: c.state.table(0),
			tilted: Array.from({ length: d }, (_, j) => tilted[j * d + j])
		},
		targetCoefficients(c.target, d)
	);
}

export interface TargetCoverage {
	misses: number;
	missesOfFidelity: number;
	falseCertificates: number;
	refused: number;
	meanCertified: number;
}

/** `experiments` Poisson experiments at `pairs` computational pairs; data seed firstSeed + e. */
export function runTargetCoverage(
	c: TargetCase,
	s: { pairs: number; confidence: number; experiments: number; firstSeed: number }
): TargetCoverage {
	const truth = trueTargetValue(c);
	const out = { misses: 0, missesOfFidelity: 0, falseCertificates: 0, refused: 0, certified: 0 };
	for (let e = 0; e < s.experiments; e++) {
		const data = sampleTables(c.state, [0, 1], s.pairs, s.firstSeed + e);
		try {
			const r = certifyTarget(data, { target: c.target, confidence: s.confidence });
			if (r.statistic.lower > truth) out.misses++;
			if (r.statistic.lower > c.state.fidelity!) out.missesOfFidelity++;
			if (r.certifiedSchmidtNumber > c.state.schmidtNumber) out.falseCertificates++;
			out.certified += r.certifiedSchmidtNumber;
		} catch (error) {
			if (!(error instanceof InputError)) throw error;
			out.refused++;
		}
	}
	const judged = s.experiments - out.refused;
	return { ...out, meanCertified: judged > 0 ? out.certified / judged : NaN };
}

/** witnesses.md §4.3′'s examples: d = 3 λ ∝ (.863, .485, .143) and d = 4 λ ∝ (.717, .501, .448, .182). */
const D3 = [0.863, 0.485, 0.143];
const D4 = [0.717, 0.501, 0.448, 0.182];

export function targetCases(): TargetCase[] {
	return [
		{ target: D3, state: truncatedTarget(D3, 1) },
		{ target: D3, state: truncatedTarget(D3, 2) },
		{ target: D3, state: targetState('0.9·Φλ + white, d=3', D3, D3, 0.9, 3, true) },
		{ target: D4, state: truncatedTarget(D4, 1) },
		{ target: D4, state: truncatedTarget(D4, 3) }
	];
}
