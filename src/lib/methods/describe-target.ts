/**
 * fidelity-target's method page (witnesses.md §4.3′). Its ladder depends on the declared λ, so the
 * page shows it for an example target: the contract's λ ∝ (.863, .485, .143) in d = 3, else 0.8^m.
 */
import { assumptionsOf } from '../evidence/cautions';
import { targetBounds, targetCoefficients } from '../certify/fidelity-target';
import { TARGET_FACTS } from '../claims/methods';
import type { MethodPage } from './describe';

export function exampleTarget(d: number): number[] {
	if (d === 3) return [0.863, 0.485, 0.143];
	return Array.from({ length: d }, (_, m) => 0.8 ** m);
}

export function describeTarget(d: number): MethodPage {
	const f = TARGET_FACTS;
	const lambda = targetCoefficients(exampleTarget(d), d);
	const rungs = targetBounds(lambda).map((bound, i) => ({ r: i + 1, bound }));
	const shown = Array.from(lambda, (x) => x.toFixed(3)).join(', ');
	return {
		...{ id: f.id, title: f.title, trust: f.trust, trustedSides: f.trustedSides, symbol: f.symbol },
		...{ statisticName: f.statisticName, formula: f.formula, basesNote: f.basesNote },
		trustNote: 'Both sides trusted; every cell of the computational basis is needed.',
		reference: f.reference,
		assumes: [
			...assumptionsOf(f.trust, false).slice(0, 2),
			'The target λ is declared with the claim, before the data, or fitted on a separate calibration run and frozen before the first check; it is never fitted on the counts being certified.',
			'Basis 1 is measured in the tilted vectors ṽ_j of that λ (side B: ṽ_j*) for the same integration time as the computational basis: its matches are divided by the computational pair total, never by their own total (that over-certifies).',
			`The ladder below is for the example target λ = (${shown}); a claim's ladder is Σ_{i≤r} λ_i² of its own λ.`
		],
		preferWhen:
			'The source’s Schmidt coefficients fall off (pixel or orbital-angular-momentum pairs) and you can set your analysers to the tilted vectors of a target declared in advance: the ladder then follows the target, not Φ_d.',
		ladder: { d, bases: [0, 1], maximum: 1, rungs }
	};
}
