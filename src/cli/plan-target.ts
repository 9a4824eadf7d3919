/** `npm run plan -- --method fidelity-target --target …`: the declared-target plan in words. */
import type { TargetPlan } from '../lib/certify/planner/plan-target';

const fixed = (x: number | null, digits = 4) => (x === null ? '–' : x.toFixed(digits));

export function readableTargetPlan(plan: TargetPlan): string {
	const r = plan.request;
	const s = plan.simulation;
	return [
		`Plan: fidelity-target, λ = (${r.target.join(', ')}), d = ${r.dimension}, Schmidt number ≥ ${r.schmidtNumber} at visibility ${r.visibility} (white noise), confidence ${r.confidence}`,
		`Critical visibility for this rung: ${fixed(plan.criticalVisibility)}`,
		`Computational pairs for ${100 * s.target} % power (tilted table at the same integration time; ${s.experiments} simulated checks per level, exact limits):`,
		`  ${plan.pairsNeeded === null ? plan.note : `${plan.pairsNeeded} pairs (power ${fixed(plan.power, 3)})`}`,
		'Rungs (F ≤ Σ_{i≤r} λ_i² for Schmidt number ≤ r):',
		...plan.rungs.map(
			(g) =>
				`  r = ${String(g.upToSchmidtNumber).padStart(3)}  bound ${fixed(g.bound, 6)}  η* ${fixed(g.criticalVisibility)}`
		)
	].join('\n');
}
